// Loads h5wasm before the TypeScript loader (tsx) is registered. Under tsx's hooks the 4 MB
// h5wasm module (it embeds its wasm binary) costs about 600 MB of memory in the loader thread;
// loaded first, it costs about 60 MB and later imports of it reuse the loaded module.
await import('h5wasm/node');
