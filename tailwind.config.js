/** Kinkless palette: slate-ink text on paper, a teal "smooth" accent, an amber "kink" warning. */
/** @type {import('tailwindcss').Config} */
export default {
	content: ['./src/**/*.{html,js,svelte,ts}'],
	theme: {
		extend: {
			colors: {
				ink: { DEFAULT: '#1d2433', soft: '#4a5568', faint: '#8a94a6' },
				paper: { DEFAULT: '#fbfaf7', deep: '#f1efe9', line: '#dcd8ce' },
				smooth: { DEFAULT: '#0f766e', light: '#ccebe7', dark: '#0b524c' },
				kink: { DEFAULT: '#c2410c', light: '#fde3d3' },
				verdict: { ok: '#15803d', warn: '#b45309', bad: '#b91c1c' }
			},
			fontFamily: {
				sans: ['"Inter Variable"', 'system-ui', 'sans-serif'],
				mono: ['ui-monospace', 'SFMono-Regular', 'Menlo', 'monospace']
			}
		}
	}
};
