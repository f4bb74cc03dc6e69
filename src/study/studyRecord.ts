// study.json of a result folder: the normalised study, its columns, formats, shard, status and the run
// summary (written with status "running" when a run starts and rewritten at its end; see runner.ts).
import { readFileSync } from 'node:fs';
import { InputError } from '../errors.js';
import type { Study } from './studyFile.js';
import { writeFileAtomic, type Shard, type StudyFormat } from './outFiles.js';
import type { StudySummary } from './runner.js';

export interface StudyRecord {
  study: unknown;
  columns: string[];
  formats?: StudyFormat[];
  shard?: Shard | null;
  status?: string;
  summary: StudySummary | null;
  /** the shard folders of a merged result set */
  mergedFrom?: string[];
}

/** The study as written to study.json (an in-memory materials library is not written out). */
export function studyRecord(study: Study): unknown {
  const m = study.base.materials;
  const base = m === undefined || Array.isArray(m) ? study.base : { ...study.base, materials: '(in-memory library)' };
  return JSON.parse(JSON.stringify({ ...study, base })) as unknown;
}

export function readStudyRecord(path: string, field = '--out'): StudyRecord {
  try {
    return JSON.parse(readFileSync(path, 'utf8')) as StudyRecord;
  } catch (err) {
    throw new InputError(field, `cannot read ${path}: ${(err as Error).message.replace(/\s+/g, ' ')}`);
  }
}

/** Write study.json (atomically), stamped with the time. */
export function writeStudyRecord(path: string, record: StudyRecord & { status: string }): void {
  writeFileAtomic(path, JSON.stringify({ ...record, updatedAt: new Date().toISOString() }, null, 2) + '\n');
}
