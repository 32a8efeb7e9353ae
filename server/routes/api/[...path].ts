/** An /api path that names no route: 404 as JSON (not the sign-in page), whoever asks. */
export default defineEventHandler((event) => {
  throw createError({ status: 404, statusMessage: 'Not Found', message: `There is no API route ${event.method} ${event.path.split('?')[0]}.` })
})
