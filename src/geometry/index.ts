/** Geometry: model import, the Scene arrays, patches, zones → sensors, the ground plane. */
export * from './sceneArrays.ts';
export * from './transform.ts';
export * from './import/index.ts';
export * from './patches.ts';
export * from './zones.ts';
export * from './ground.ts';
