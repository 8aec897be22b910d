import { demoScheme } from '@trabeate/structural';
import { HttpError } from '../core/errors';
import { readDocument, storedDocument, upgradeDocument, type DocumentUpgrade } from './scheme-document';

describe('scheme documents on the way into storage', () => {
  // An imagined history of three document versions, to exercise the path itself.
  const upgrades: Record<number, DocumentUpgrade> = {
    1: (d) => ({ ...d, addedIn2: true }),
    2: (d) => ({ ...d, renamedIn3: d['addedIn2'], addedIn2: undefined }),
  };

  it('upgrades an older document one version at a time up to the latest', () => {
    expect(upgradeDocument({ schemaVersion: 1, id: 's' }, upgrades, 3)).toEqual({
      schemaVersion: 3,
      id: 's',
      renamedIn3: true,
      addedIn2: undefined,
    });
    expect(upgradeDocument({ schemaVersion: 2, id: 's', addedIn2: false }, upgrades, 3)).toMatchObject({
      schemaVersion: 3,
      renamedIn3: false,
    });
  });

  it('refuses a document newer than the server reads, or without a version, as a client mistake', () => {
    for (const raw of [{ schemaVersion: 4 }, { id: 'no version' }, [], 'text']) {
      const attempt = () => upgradeDocument(raw, upgrades, 3);
      expect(attempt).toThrow(HttpError);
      try {
        attempt();
      } catch (e) {
        expect((e as HttpError).status).toBe(400);
      }
    }
  });

  it('treats a gap in the upgrade path as a bug of ours, not the sender', () => {
    expect(() => upgradeDocument({ schemaVersion: 1 }, { 2: (d) => d }, 3)).toThrow(
      /no upgrade from scheme document version 1/,
    );
  });

  it("accepts the engine's demo scheme and names each wrong field of a broken one", () => {
    expect(readDocument(demoScheme()).columns).toHaveLength(20);
    const broken = { ...demoScheme(), grid: [{ id: 'G', label: 'G' }] };
    try {
      readDocument(broken);
      throw new Error('accepted a grid line with neither x nor y');
    } catch (e) {
      expect(e).toBeInstanceOf(HttpError);
      expect(Object.keys((e as HttpError).fields ?? {})).toContain('body.document.grid.0.x');
    }
  });

  it('reads a version 1 document as version 2 with no footing choices recorded', () => {
    const { footingChoices: _none, ...v1 } = { ...demoScheme(), schemaVersion: 1 };
    const upgraded = storedDocument(v1);
    expect(upgraded.schemaVersion).toBe(2);
    expect(upgraded.footingChoices).toEqual([]);
    expect(upgraded.columns).toEqual(demoScheme().columns);
  });

  it('names the reason of a footing choice left blank', () => {
    const doc = { ...demoScheme(), footingChoices: [{ columnId: 'A1', option: 'strap', reason: ' ' }] };
    try {
      readDocument(doc);
      throw new Error('accepted a choice without a reason');
    } catch (e) {
      expect(Object.keys((e as HttpError).fields ?? {})).toEqual(['body.document.footingChoices.0.reason']);
    }
  });
});
