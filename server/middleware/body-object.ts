// Every JSON body an API route reads is an object, and none may carry a `__proto__` or `constructor` key. Such a
// body (valid JSON, which body-guard.ts has already bounded and checked) is refused here naming `body`. Left to the
// framework, its stricter parse (destr) answered an unnamed "Invalid JSON body" for those keys and for some numbers
// (-0.0000464…, 584665965305162760000), and a body of null read as no body at all.
// The two patterns are destr's own, so what is refused here is exactly what it would refuse, including \u escapes.
const PROTO_KEY = /"(?:_|\\u0{2}5[Ff]){2}(?:p|\\u0{2}70)(?:r|\\u0{2}72)(?:o|\\u0{2}6[Ff])(?:t|\\u0{2}74)(?:o|\\u0{2}6[Ff])(?:_|\\u0{2}5[Ff]){2}"\s*:/
const CONSTRUCTOR_KEY = /"(?:c|\\u0063)(?:o|\\u006[Ff])(?:n|\\u006[Ee])(?:s|\\u0073)(?:t|\\u0074)(?:r|\\u0072)(?:u|\\u0075)(?:c|\\u0063)(?:t|\\u0074)(?:o|\\u006[Ff])(?:r|\\u0072)"\s*:/

export default defineEventHandler(async (event) => {
  if (!event.path.startsWith('/api/') || !['POST', 'PATCH', 'PUT', 'DELETE'].includes(event.method)) return
  const type = (getRequestHeader(event, 'content-type') ?? '').toLowerCase()
  if (type && !type.startsWith('application/json')) return
  // body-guard has read the body already (h3 keeps it) and refused what is not JSON; an object is what starts with {.
  const raw = await readRawBody(event, 'utf8')
  const first = raw?.trimStart()[0]
  if (first === undefined) return
  if (first !== '{') throw createError({ statusCode: 400, message: 'body: must be a JSON object', data: { fields: { body: 'must be a JSON object' } } })
  if (PROTO_KEY.test(raw!) || CONSTRUCTOR_KEY.test(raw!)) {
    throw createError({ statusCode: 400, message: 'body: a key named __proto__ or constructor is not accepted', data: { fields: { body: 'has a __proto__ or constructor key' } } })
  }
})
