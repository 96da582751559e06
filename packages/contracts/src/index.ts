// zod schemas and types shared by the API (validation, OpenAPI) and the web app (forms).
export * from './common.ts';
export * from './errors.ts';
export * from './campaign.ts';
export * from './geometry.ts';
export * from './schedule.ts';
export * from './kit.ts';
export * from './settings.ts';
export * from './noise.ts';
export * from './fe-model.ts';
export * from './fe-map.ts';
export * from './axis.ts';
export * from './bridge.ts';
export * from './fe-api.ts';
export * from './hits.ts';
export * from './mode-rows.ts';
