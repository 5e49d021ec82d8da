export * from './read.js';
export * from './text/index.js';
