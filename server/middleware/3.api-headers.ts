/**
 * API answers are data, never documents: nothing in them may run or be framed, and no cache
 * along the way may keep a copy of a record (the page headers come from nuxt-security).
 */
export default defineEventHandler((event) => {
  if (!event.path.startsWith('/api/')) return
  setResponseHeaders(event, {
    'content-security-policy': 'default-src \'none\'; frame-ancestors \'none\'',
    'cache-control': 'no-store',
  })
})
