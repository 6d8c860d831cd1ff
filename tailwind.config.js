/** Kinkless palette: slate-ink text on paper, a teal "smooth" accent, an amber "kink" warning. */
/** @type {import('tailwindcss').Config} */
export default {
	content: ['./src/**/*.{html,js,svelte,ts}'],
	theme: {
		extend: {
			colors: {
				ink: { DEFAULT: '#1d2433', soft: '#4a5568', faint: '#5b6577' },
				paper: { DEFAULT: '#fbfaf7', deep: '#f1efe9', line: '#dcd8ce' },
				smooth: { DEFAULT: '#0f766e', light: '#ccebe7', dark: '#0b524c' },
				kink: { DEFAULT: '#c2410c', light: '#fde3d3', dark: '#9a3412' },
				verdict: { ok: '#166534', warn: '#92400e', bad: '#b91c1c' }
			},
			fontFamily: {
				sans: ['"Inter Variable"', 'system-ui', 'sans-serif'],
				mono: ['ui-monospace', 'SFMono-Regular', 'Menlo', 'monospace']
			}
		}
	}
};
