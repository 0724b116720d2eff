/** The JSON Schema of the study file, generated from the zod schema (committed as study.schema.json). */
import { z } from 'zod';
import { StudySchema, STUDY_VERSION } from './schema.ts';

export function studyJsonSchema(): Record<string, unknown> {
  const schema = z.toJSONSchema(StudySchema, { io: 'input', unrepresentable: 'any' }) as Record<string, unknown>;
  return {
    ...schema,
    $id: `https://landreach.example.invalid/schema/study-v${STUDY_VERSION}.json`,
    title: `Landreach study file, format version ${STUDY_VERSION}`,
  };
}
