export * from './read.js';
export * from './write.js';
export { parseNumberCell, MAX_LINE_LENGTH, type Delimiter } from './fields.js';
