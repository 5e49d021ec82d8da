// Public API of the velocity area; each module of the area is re-exported here.
export {};
