// Close the database pool when the server stops, so a restart never leaves connections behind.
export default defineNitroPlugin((nitro) => {
  nitro.hooks.hook('close', async () => {
    await closeDb()
  })
})
