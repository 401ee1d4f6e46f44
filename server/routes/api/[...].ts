// An address under /api that no route answers is a 404 in JSON, never the sign-in page or an HTML error page.
export default defineEventHandler((event) => {
  throw createError({ statusCode: 404, message: `No API route answers ${event.method} ${event.path.split('?')[0]}` })
})
