import { json, type RequestHandler } from '@sveltejs/kit';
import { errorBody } from '$lib/server/api';

const notFound: RequestHandler = ({ url }) => json(errorBody(404, `no API route ${url.pathname}`), { status: 404 });
export const GET = notFound;
export const POST = notFound;
export const PUT = notFound;
export const PATCH = notFound;
export const DELETE = notFound;
