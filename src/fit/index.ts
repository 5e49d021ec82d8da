// Public API of the fit area; each module of the area is re-exported here.
export {};
