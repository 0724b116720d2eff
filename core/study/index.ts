export * from './schema.ts';
export * from './load.ts';
export * from './toDescent.ts';
export { studyJsonSchema } from './jsonSchema.ts';
export * from './provenance.ts';
