// Property-based checks of the beam analysis with fast-check: statics and linearity that must
// hold for any beam, whatever the handbook covers. Source: no table — equilibrium of forces and
// moments and linear superposition (derived); the handbook values are checked in beam.spec.ts.
import fc from 'fast-check';
import { analyseBeam, BeamLoad, BeamModel, continuousBeam } from './beam';

const beamArb = fc
  .record({
    spans: fc.array(fc.double({ min: 1, max: 9, noNaN: true }), { minLength: 1, maxLength: 6 }),
    left: fc.option(fc.double({ min: 0.5, max: 3, noNaN: true }), { nil: undefined }),
    right: fc.option(fc.double({ min: 0.5, max: 3, noNaN: true }), { nil: undefined }),
    leftEnd: fc.constantFrom<'pin' | 'fixed'>('pin', 'fixed'),
    rightEnd: fc.constantFrom<'pin' | 'fixed'>('pin', 'fixed'),
    ei: fc.double({ min: 1e3, max: 1e6, noNaN: true }),
  })
  .map((r) =>
    continuousBeam({
      spansM: r.spans,
      eiKNm2: r.ei,
      leftCantileverM: r.left,
      rightCantileverM: r.right,
      leftEnd: r.leftEnd,
      rightEnd: r.rightEnd,
    }),
  );

const loadsArb = (m: BeamModel) =>
  fc.array(
    fc.oneof(
      fc
        .record({
          member: fc.nat(m.members.length - 1),
          f: fc.double({ min: 0, max: 1, noNaN: true }),
          p: fc.double({ min: -50, max: 200, noNaN: true }),
        })
        .map(({ member, f, p }): BeamLoad => ({
          kind: 'point',
          member,
          atM: f * m.members[member].lengthM,
          forceKN: p,
        })),
      fc
        .record({
          member: fc.nat(m.members.length - 1),
          a: fc.double({ min: 0, max: 1, noNaN: true }),
          b: fc.double({ min: 0, max: 1, noNaN: true }),
          w1: fc.double({ min: 0, max: 40, noNaN: true }),
          w2: fc.double({ min: 0, max: 40, noNaN: true }),
        })
        .map(({ member, a, b, w1, w2 }): BeamLoad => {
          const L = m.members[member].lengthM;
          return {
            kind: 'linear',
            member,
            fromM: Math.min(a, b) * L,
            toM: Math.max(a, b) * L,
            startKNPerM: w1,
            endKNPerM: w2,
          };
        }),
    ),
    { minLength: 1, maxLength: 8 },
  );

const withLoads = beamArb.chain((m) => loadsArb(m).map((loads) => ({ m, loads })));
const applied = (loads: BeamLoad[]) =>
  loads.reduce(
    (a, l) => a + (l.kind === 'point' ? l.forceKN : ((l.startKNPerM + l.endKNPerM) / 2) * (l.toM - l.fromM)),
    0,
  );
const scale = (loads: BeamLoad[]) =>
  Math.max(
    1,
    ...loads.map((l) => (l.kind === 'point' ? Math.abs(l.forceKN) : Math.max(l.startKNPerM, l.endKNPerM) * 10)),
  );

describe('beam analysis properties (fast-check)', () => {
  it('reactions balance the applied load, vertically and in moment about the first node', () => {
    fc.assert(
      fc.property(withLoads, ({ m, loads }) => {
        const r = analyseBeam(m, loads, { samplesPerMember: 4 });
        expect(r.problems).toEqual([]);
        const s = scale(loads) * 1e-8;
        expect(Math.abs(r.reactions.reduce((a, x) => a + x.forceKN, 0) - applied(loads))).toBeLessThan(s * 100);
        const starts = [0];
        m.members.forEach((mb, i) => starts.push(starts[i] + mb.lengthM));
        const loadMoment = loads.reduce((a, l) => {
          if (l.kind === 'point') return a + l.forceKN * (starts[l.member] + l.atM);
          const h = l.toM - l.fromM;
          const W = ((l.startKNPerM + l.endKNPerM) / 2) * h;
          const mo =
            l.startKNPerM * h * (l.fromM + h / 2) + (((l.endKNPerM - l.startKNPerM) * h) / 2) * (l.fromM + (2 * h) / 3);
          return a + W * starts[l.member] + mo;
        }, 0);
        const reactMoment = r.reactions.reduce((a, x) => a + x.forceKN * x.xM + x.momentKNm, 0);
        expect(Math.abs(reactMoment - loadMoment)).toBeLessThan(s * 1e4);
      }),
      { numRuns: 150 },
    );
  });

  it('moments at free ends and at pinned ends are zero', () => {
    fc.assert(
      fc.property(withLoads, ({ m, loads }) => {
        const r = analyseBeam(m, loads, { samplesPerMember: 2 });
        const tol = scale(loads) * 1e-7;
        const last = m.members.length - 1;
        if (m.supports[0] !== 'fixed') expect(Math.abs(r.members[0].startMomentKNm)).toBeLessThan(tol * 100);
        if (m.supports[last + 1] !== 'fixed') expect(Math.abs(r.members[last].endMomentKNm)).toBeLessThan(tol * 100);
      }),
      { numRuns: 150 },
    );
  });

  it('a mirror-image beam and loading gives mirror-image reactions and moments', () => {
    fc.assert(
      fc.property(withLoads, ({ m, loads }) => {
        const n = m.members.length;
        const mm: BeamModel = { members: [...m.members].reverse(), supports: [...m.supports].reverse() };
        const ml: BeamLoad[] = loads.map((l) => {
          const L = m.members[l.member].lengthM;
          return l.kind === 'point'
            ? { ...l, member: n - 1 - l.member, atM: L - l.atM }
            : {
                ...l,
                member: n - 1 - l.member,
                fromM: L - l.toM,
                toM: L - l.fromM,
                startKNPerM: l.endKNPerM,
                endKNPerM: l.startKNPerM,
              };
        });
        const a = analyseBeam(m, loads, { samplesPerMember: 2 });
        const b = analyseBeam(mm, ml, { samplesPerMember: 2 });
        const tol = scale(loads) * 1e-6;
        a.reactions.forEach((r, i) => {
          expect(Math.abs(r.forceKN - b.reactions[n - i].forceKN)).toBeLessThan(tol * 10);
          expect(Math.abs(r.momentKNm + b.reactions[n - i].momentKNm)).toBeLessThan(tol * 100);
        });
        a.members.forEach((x, i) =>
          expect(Math.abs(x.startMomentKNm - b.members[n - 1 - i].endMomentKNm)).toBeLessThan(tol * 100),
        );
      }),
      { numRuns: 100 },
    );
  });

  it('superposition: the result of two load sets together is the sum of each alone', () => {
    fc.assert(
      fc.property(
        beamArb.chain((m) => fc.tuple(fc.constant(m), loadsArb(m), loadsArb(m))),
        ([m, l1, l2]) => {
          const a = analyseBeam(m, l1, { samplesPerMember: 2 });
          const b = analyseBeam(m, l2, { samplesPerMember: 2 });
          const c = analyseBeam(m, [...l1, ...l2], { samplesPerMember: 2 });
          const tol = (scale(l1) + scale(l2)) * 1e-6;
          c.reactions.forEach((r, i) =>
            expect(Math.abs(r.forceKN - a.reactions[i].forceKN - b.reactions[i].forceKN)).toBeLessThan(tol * 10),
          );
          c.members.forEach((x, i) => {
            expect(Math.abs(x.startMomentKNm - a.members[i].startMomentKNm - b.members[i].startMomentKNm)).toBeLessThan(
              tol * 100,
            );
            expect(Math.abs(x.endMomentKNm - a.members[i].endMomentKNm - b.members[i].endMomentKNm)).toBeLessThan(
              tol * 100,
            );
          });
          c.nodes.forEach((x, i) =>
            expect(Math.abs(x.deflectionMm - a.nodes[i].deflectionMm - b.nodes[i].deflectionMm)).toBeLessThan(
              1e-6 * (1 + Math.abs(x.deflectionMm)),
            ),
          );
        },
      ),
      { numRuns: 100 },
    );
  });
});

describe('banded solver against a dense solve', () => {
  it('gives the same displacements as Gaussian elimination on the full matrix', async () => {
    const { prepareBeam, solveTerms, memberTerms } = await import('./beam');
    const { solveDense } = await import('./banded');
    const { assembleDense } = await import('./beam');
    fc.assert(
      fc.property(withLoads, ({ m, loads }) => {
        const p = prepareBeam(m);
        const t = m.members.map((mb, i) =>
          memberTerms(
            mb.lengthM,
            loads.filter((l) => l.member === i),
          ),
        );
        const band = solveTerms(p, t);
        const { a, rhs, n } = assembleDense(m, t);
        solveDense(n, a, rhs);
        for (let k = 0; k < p.dof.length; k++) {
          if (p.dof[k] < 0) continue;
          expect(Math.abs(band.u[k] - rhs[p.dof[k]])).toBeLessThan(1e-9 * (1 + Math.abs(rhs[p.dof[k]])) * 1e3);
        }
      }),
      { numRuns: 50 },
    );
  });
});
