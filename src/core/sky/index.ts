export * from './angles';
export * from './sexagesimal';
export * from './separation';
export * from './tangentPlane';
export * from './frames';
export * from './sersic';
export * from './galaxyRadius';
