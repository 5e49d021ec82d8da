// Public API of the notebook area; each module of the area is re-exported here.
export {};
