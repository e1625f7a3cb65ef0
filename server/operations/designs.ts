// Designs and their revisions. A revision is written once; an edit adds the next one.
import { randomUUID } from 'node:crypto';
import { fn, col, type Sequelize } from 'sequelize';
import type { DesignRevisionData } from '../../shared/schemas/designs';
import { conflict } from '../http/errors';
import { BenchSession, Design, DesignRevision, User } from '../models';

export async function createDesign(
  sequelize: Sequelize,
  input: { name: string; description: string; revision: DesignRevisionData },
  author: { id: string },
): Promise<Design> {
  return sequelize.transaction(async (transaction) => {
    if (await Design.findOne({ where: { name: input.name }, transaction })) {
      throw conflict(`A design named "${input.name}" already exists`, { name: 'already used' });
    }
    const design = await Design.create({ id: randomUUID(), name: input.name, description: input.description, createdById: author.id }, { transaction });
    await DesignRevision.create(
      {
        id: randomUUID(),
        designId: design.id,
        revision: 1,
        label: input.revision.label,
        topology: input.revision.circuit.topology,
        circuit: input.revision.circuit,
        limitMask: input.revision.limitMask,
        changeNote: input.revision.changeNote,
        createdById: author.id,
      },
      { transaction },
    );
    return design;
  });
}

export async function addDesignRevision(
  sequelize: Sequelize,
  designId: string,
  input: DesignRevisionData,
  author: { id: string },
): Promise<DesignRevision> {
  return sequelize.transaction(async (transaction) => {
    // Locking the design serialises concurrent edits, so revision numbers never collide.
    const design = await Design.findByPk(designId, { transaction, lock: transaction.LOCK.UPDATE });
    if (!design) throw conflict('No such design');
    const latest = (await DesignRevision.max('revision', { where: { designId }, transaction })) as number | null;
    if (await DesignRevision.findOne({ where: { designId, label: input.label }, transaction })) {
      throw conflict(`Revision label "${input.label}" is already used by this design`, { label: 'already used' });
    }
    const revision = await DesignRevision.create(
      {
        id: randomUUID(),
        designId,
        revision: (latest ?? 0) + 1,
        label: input.label,
        topology: input.circuit.topology,
        circuit: input.circuit,
        limitMask: input.limitMask,
        changeNote: input.changeNote,
        createdById: author.id,
      },
      { transaction },
    );
    design.changed('updatedAt', true);
    await design.save({ transaction });
    return revision;
  });
}

/** Bench sessions per design revision id. */
export async function sessionCountsByRevision(revisionIds: string[]): Promise<Map<string, number>> {
  if (revisionIds.length === 0) return new Map();
  const rows = (await BenchSession.findAll({
    attributes: ['designRevisionId', [fn('count', col('id')), 'count']],
    where: { designRevisionId: revisionIds },
    group: ['designRevisionId'],
    raw: true,
  })) as unknown as { designRevisionId: string; count: string }[];
  return new Map(rows.map((row) => [row.designRevisionId, Number(row.count)]));
}

export async function loadDesignWithRevisions(designId: string) {
  const design = await Design.findByPk(designId, { include: [{ model: User, as: 'createdBy' }] });
  if (!design) return null;
  const revisions = await DesignRevision.findAll({
    where: { designId },
    include: [{ model: User, as: 'createdBy' }],
    order: [['revision', 'DESC']],
  });
  return { design, revisions, sessionCounts: await sessionCountsByRevision(revisions.map((revision) => revision.id)) };
}
