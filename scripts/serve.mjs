// The production server: SvelteKit's adapter-node request handler behind a plain
// node:http server, so that the security headers go on every response — pages, API,
// and the static files the handler serves before any of the app's hooks run.
// Same environment as `node build` (PORT, HOST, ORIGIN, ADDRESS_HEADER, BODY_SIZE_LIMIT, …).
import http from 'node:http';
import path from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const { handler } = await import(pathToFileURL(path.join(root, 'build', 'handler.js')).href);

const https = (process.env.ORIGIN ?? '').startsWith('https://');

/** Headers every response carries (a page or route may set its own value of any of them). */
const BASE_HEADERS = {
	'x-content-type-options': 'nosniff',
	'referrer-policy': 'same-origin',
	'x-frame-options': 'DENY',
	'permissions-policy': 'camera=(), microphone=(), geolocation=()',
	'cross-origin-opener-policy': 'same-origin',
	// files and API answers are not documents; pages replace this with SvelteKit's policy
	'content-security-policy': "default-src 'none'; style-src 'unsafe-inline'; img-src 'self' data:; font-src 'self'; frame-ancestors 'none'; base-uri 'none'; form-action 'none'",
	...(https ? { 'strict-transport-security': 'max-age=31536000; includeSubDomains' } : {})
};

const server = http.createServer((req, res) => {
	for (const [k, v] of Object.entries(BASE_HEADERS)) res.setHeader(k, v);
	handler(req, res, () => {
		res.statusCode = 404;
		res.setHeader('content-type', 'text/plain; charset=utf-8');
		res.end('not found');
	});
});

const host = process.env.HOST ?? '0.0.0.0';
const port = Number(process.env.PORT ?? 3000);
server.listen(port, host, () => console.log(`Listening on http://${host}:${port}`));

// as adapter-node does: finish requests in flight, then tell the app (it stops its workers)
let stopping = false;
function shutdown(reason) {
	if (stopping) return;
	stopping = true;
	server.closeIdleConnections();
	server.close(() => process.emit('sveltekit:shutdown', reason));
	setTimeout(() => server.closeAllConnections(), Number(process.env.SHUTDOWN_TIMEOUT ?? 30) * 1000).unref();
}
process.on('SIGTERM', () => shutdown('SIGTERM'));
process.on('SIGINT', () => shutdown('SIGINT'));
