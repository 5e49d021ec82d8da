// Public API of the notebook area: MIME bundles and display in the tslab kernel.
export { mimeBundle, plotBundle, tableBundle, type MimeBundle, type Displayable } from './bundle.js';
export { display, kernelChannel, type DisplayOptions, type KernelChannel } from './display.js';
