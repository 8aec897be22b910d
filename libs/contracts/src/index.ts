// The request/response shapes shared by the API and the client. Each schema is a zod object:
// the server validates with it, the client takes its types with z.infer.
export * from './health';
export * from './auth';
export * from './firm';
export * from './scheme';
export * from './projects';
export * from './schemes';
export * from './errors';
export * from './drawings';
export * from './fees';
export * from './stage-review';
export * from './scheme-outputs';
