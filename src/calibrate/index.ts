// Public API of the calibrate area; each module of the area is re-exported here.
export {};
