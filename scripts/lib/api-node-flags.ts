// The Node flags the API runs with in production: docker/Dockerfile's CMD (a test in
// test/build/api-node-flags.spec.ts keeps the two the same), and the benches, which measure the
// bundled API as production runs it.
//
// The heap sizes come from bench:register's per-phase memory table (README, "Benchmarks"). With
// V8's defaults on a machine with plenty of memory, the young generation grows to 2 × 16 MB during
// start-up and stays there, and the old generation may grow to about four times what survived the
// last full collection before collecting again: under 10 concurrent register requests the API's
// heap, whose live part stayed at 51–53 MB, filled to 100–140 MB, mostly garbage (objects of
// requests waiting on PostgreSQL, promoted while still in flight). A 512 MB old-generation limit
// makes V8 grow the heap by about 1.4× rather than up to 4× (V8's heap controller scales its growing
// factor with the limit: from memory of V8's source, not a documented figure; the bench's table
// is what shows it). Uploads and ZIPs stream and the PDFs the API makes are a few pages, so 512 MB
// is headroom, not a squeeze. The semi-spaces stay at 16 MB (V8's own size here, written out so
// it does not move with V8): 4 MB ones cut another 20 MB off the register bench's peak but cost
// a fifth more CPU per signed-in read in bench:api (more frequent scavenges of the requests in
// flight); with 16 MB the register bench peaked at 174.5 MB (README, "Benchmarks").
export const API_NODE_FLAGS = ['--max-old-space-size=512', '--max-semi-space-size=16', '--enable-source-maps'];
