// Public API of the plot area; each module of the area is re-exported here.
export {};
