// Public API of the orbit area; each module of the area is re-exported here.
export {};
