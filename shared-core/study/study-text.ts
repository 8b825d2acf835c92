import { canonicalJson } from './canonical-json.js';
import { fieldPath } from './field-schemas.js';
import { migrateStudy } from './migrations.js';
import { currentSchemaVersion, studySchema, type Study } from './study-schema.js';
import { fail, ok, type Result } from '../result.js';

/**
 * The study's file text: deterministic, so that open then save gives the same bytes, and readable:
 * one observation and one event per line, every object's keys in canonical (RFC 8785) order.
 */
export function formatStudy(study: Study): string {
  const order = [
    'schemaVersion',
    'id',
    'identity',
    'source',
    'observations',
    'method',
    'events',
    'header',
    'revisions',
    'siteSettings',
  ] as const;
  const members = order
    .filter((key) => study[key] !== undefined)
    .map((key) => {
      const value = study[key];
      const text =
        key === 'observations' || key === 'events'
          ? oneItemPerLine(value as unknown[])
          : JSON.stringify(JSON.parse(canonicalJson(value)), null, 2).replaceAll('\n', '\n  ');
      return `  ${JSON.stringify(key)}: ${text}`;
    });
  return `{\n${members.join(',\n')}\n}\n`;
}

function oneItemPerLine(items: unknown[]): string {
  return items.length === 0
    ? '[]'
    : `[\n${items.map((item) => `    ${canonicalJson(item)}`).join(',\n')}\n  ]`;
}

export interface ParsedStudy {
  study: Study;
  /** The schema version the text was written in, when it was brought forward; else null. */
  migratedFrom: number | null;
}

/**
 * Reads a study's text: JSON, then migrations, then the schema. A failure names the field (as a
 * path such as `events[3].time`) and what is wrong with it.
 */
export function parseStudy(text: string, file?: string): Result<ParsedStudy> {
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch (error) {
    return fail({
      file,
      message: `is not a study file: its JSON does not parse (${(error as Error).message})`,
    });
  }
  const version = (raw as { schemaVersion?: unknown } | null)?.schemaVersion;
  if (typeof version !== 'number' || !Number.isInteger(version) || version < 0) {
    return fail({
      file,
      message: 'field "schemaVersion" is missing or not a schema version: this is not a study file',
    });
  }
  if (version > currentSchemaVersion) {
    return fail({
      file,
      message: `field "schemaVersion" is ${version}, newer than this program reads (${currentSchemaVersion}): update Limit Ledger to open it`,
    });
  }
  const migrated = migrateStudy(raw, version);
  if (!migrated.ok) return fail(...migrated.findings.map((finding) => ({ ...finding, file })));
  const parsed = studySchema.safeParse(migrated.value);
  if (!parsed.success) {
    return fail(
      ...parsed.error.issues
        .slice(0, 10)
        .map((issue) => ({ file, message: `field "${fieldPath(issue.path)}": ${issue.message}` })),
    );
  }
  return ok({ study: parsed.data, migratedFrom: version === currentSchemaVersion ? null : version });
}
