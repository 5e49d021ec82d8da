export * from './read.js';
