import { describe, expect, it } from 'vitest';
import { areaById, areas, roleMayOpen, visibleAreas } from '../../../src/app/navigation';

const labels = (list: { label: string }[]) => list.map((area) => area.label);
const everyone = ['Overview', 'Designs', 'Bench sessions', 'Compare', 'Instruments'];

describe('visibleAreas', () => {
  it('shows a technician the work areas and settings, never People or Mailbox', () => {
    expect(labels(visibleAreas('technician', 'local-stand-in'))).toEqual([...everyone, 'Settings']);
  });

  it('shows a designer the same areas as a technician', () => {
    expect(labels(visibleAreas('designer', 'local-stand-in'))).toEqual([...everyone, 'Settings']);
  });

  it('shows a lead People and, with the local mail stand-in, Mailbox', () => {
    expect(labels(visibleAreas('lead', 'local-stand-in'))).toEqual([...everyone, 'People', 'Mailbox', 'Settings']);
  });

  it('hides Mailbox from a lead when mail goes out over SMTP', () => {
    expect(labels(visibleAreas('lead', 'smtp'))).toEqual([...everyone, 'People', 'Settings']);
  });

  it('hides Mailbox while the mail mode is not yet known', () => {
    expect(labels(visibleAreas('lead', undefined))).not.toContain('Mailbox');
  });
});

describe('roleMayOpen', () => {
  it('lets only a lead open People and Mailbox', () => {
    for (const id of ['people', 'mailbox'] as const) {
      expect(roleMayOpen(areaById(id), 'lead')).toBe(true);
      expect(roleMayOpen(areaById(id), 'designer')).toBe(false);
      expect(roleMayOpen(areaById(id), 'technician')).toBe(false);
    }
  });

  it('lets every role open the areas without a role list', () => {
    for (const area of areas.filter((candidate) => candidate.roles === undefined)) {
      expect(roleMayOpen(area, 'technician')).toBe(true);
    }
  });
});

describe('areaById', () => {
  it('throws naming the unknown id', () => {
    expect(() => areaById('nowhere' as never)).toThrow('areaById: no area with id "nowhere"');
  });

  it('has a distinct path for every area', () => {
    expect(new Set(areas.map((area) => area.path)).size).toBe(areas.length);
  });
});
