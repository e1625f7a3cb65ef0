import type { DesignDetail, DesignRevision as DesignRevisionView, DesignSummary } from '../../shared/schemas/designs';
import type { Design, DesignRevision } from '../models';

const person = (user: { id: string; name: string } | undefined | null) => (user ? { id: user.id, name: user.name } : { id: '', name: '(unknown)' });

export function presentDesignRevision(revision: DesignRevision, sessionCount: number): DesignRevisionView {
  return {
    id: revision.id,
    designId: revision.designId,
    revision: revision.revision,
    label: revision.label,
    circuit: revision.circuit,
    limitMask: revision.limitMask,
    changeNote: revision.changeNote,
    createdBy: person(revision.createdBy),
    createdAt: revision.createdAt.toISOString(),
    sessionCount,
  };
}

/** `revisions` newest first; `sessionCounts` by revision id. */
export function presentDesignSummary(design: Design, revisions: DesignRevision[], sessionCounts: Map<string, number>): DesignSummary {
  const latest = revisions[0];
  return {
    id: design.id,
    name: design.name,
    description: design.description,
    latestRevision: { id: latest.id, revision: latest.revision, label: latest.label, createdAt: latest.createdAt.toISOString(), topology: latest.topology },
    revisionCount: revisions.length,
    sessionCount: revisions.reduce((sum, revision) => sum + (sessionCounts.get(revision.id) ?? 0), 0),
    createdAt: design.createdAt.toISOString(),
  };
}

export function presentDesignDetail(design: Design, revisions: DesignRevision[], sessionCounts: Map<string, number>): DesignDetail {
  return {
    id: design.id,
    name: design.name,
    description: design.description,
    createdAt: design.createdAt.toISOString(),
    createdBy: person(design.createdBy),
    revisions: revisions.map((revision) => presentDesignRevision(revision, sessionCounts.get(revision.id) ?? 0)),
  };
}
