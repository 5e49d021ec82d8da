// Public API of the notebook area: MIME bundles and display in the tslab kernel.
export { mimeBundle, plotBundle, tableBundle, resultBundle, displayMessages, type MimeBundle, type Displayable, type BundleOptions } from './bundle.js';
export { display, kernelChannel, type DisplayOptions, type KernelChannel } from './display.js';
