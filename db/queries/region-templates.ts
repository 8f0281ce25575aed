import { getDb } from '../index';
import type { Region } from './regions';
import { recordAudit } from './audit';

export type RegionTemplate = { id: string; projectId: string; name: string; imageWidth: number; imageHeight: number; regions: Omit<Region, 'source'>[]; updatedAt: Date };

type Row = { id: string; project_id: string; name: string; image_width: number; image_height: number; regions: Omit<Region, 'source'>[]; updated_at: Date };

const toTemplate = (r: Row): RegionTemplate => ({ id: r.id, projectId: r.project_id, name: r.name, imageWidth: r.image_width, imageHeight: r.image_height, regions: r.regions, updatedAt: r.updated_at });

export async function listRegionTemplates(labId: string, projectId: string): Promise<RegionTemplate[]> {
  const rows: Row[] = await getDb()('region_templates').where({ lab_id: labId, project_id: projectId }).orderBy('name');
  return rows.map(toTemplate);
}

export async function getRegionTemplate(labId: string, id: string): Promise<RegionTemplate | null> {
  const row: Row | undefined = await getDb()('region_templates').where({ lab_id: labId, id }).first();
  return row ? toTemplate(row) : null;
}

/** Saves under a name, replacing a template of the same name in the project (a jig is re-measured, not duplicated). */
export async function saveRegionTemplate(
  labId: string,
  userId: string,
  input: { projectId: string; name: string; imageWidth: number; imageHeight: number; regions: Omit<Region, 'source'>[] },
): Promise<RegionTemplate> {
  const db = getDb();
  return db.transaction(async (trx) => {
    const [row] = await trx('region_templates')
      .insert({ lab_id: labId, project_id: input.projectId, name: input.name, image_width: input.imageWidth, image_height: input.imageHeight, regions: JSON.stringify(input.regions) })
      .onConflict(['project_id', 'name'])
      .merge({ image_width: input.imageWidth, image_height: input.imageHeight, regions: JSON.stringify(input.regions), updated_at: trx.fn.now() })
      .returning<Row[]>('*');
    if (!row) throw new Error('insert returned nothing');
    await recordAudit({ labId, userId, action: 'template.save', targetType: 'region_template', targetId: row.id, details: { name: input.name } }, trx);
    return toTemplate(row);
  });
}
