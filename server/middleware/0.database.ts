/** Opens and migrates the database before the first API request is handled. */
export default defineEventHandler(async (event) => {
  if (event.path.startsWith('/api/')) await useDB()
})
