// The demo's fixed ids and names, apart from the seeding code so the identity seed can share them.
export const DEMO = {
  firm: { id: '0b8c2d1e-0000-4000-8000-000000000001', name: 'Sable Quay Structural', slug: 'sable-quay' },
  clients: {
    fenwick: { id: '0b8c2d1e-0000-4000-8000-000000000101', name: 'Fenwick Row Developments' },
    harbourlight: { id: '0b8c2d1e-0000-4000-8000-000000000102', name: 'Harbourlight Schools Trust' },
  },
  users: {
    principal: {
      id: '0b8c2d1e-0000-4000-8000-000000000201',
      email: 'ines.varga@sablequay.example',
      name: 'Ines Varga-Holm',
    },
    engineerA: {
      id: '0b8c2d1e-0000-4000-8000-000000000202',
      email: 'tomas.ekwueme@sablequay.example',
      name: 'Tomas Ekwueme',
    },
    engineerB: {
      id: '0b8c2d1e-0000-4000-8000-000000000203',
      email: 'priya.lindqvist@sablequay.example',
      name: 'Priya Lindqvist',
    },
    fenwickContact: {
      id: '0b8c2d1e-0000-4000-8000-000000000204',
      email: 'odile.marchetti@fenwickrow.example',
      name: 'Odile Marchetti',
    },
    harbourlightContact: {
      id: '0b8c2d1e-0000-4000-8000-000000000205',
      email: 'rafe.okonkwo@harbourlight.example',
      name: 'Rafe Okonkwo',
    },
  },
  projects: {
    kestrel: { id: '0b8c2d1e-0000-4000-8000-000000000301', reference: 'SQ-2026-014' },
    alder: { id: '0b8c2d1e-0000-4000-8000-000000000302', reference: 'SQ-2026-021' },
  },
} as const;

/**
 * Invented unit rates in euros (concrete per m³, reinforcement per kg, formwork per m²), of a
 * plausible order for the demo only; the projects' design bases carry them and new schemes start
 * from them.
 */
export const DEMO_RATES = {
  kestrel: { concretePerM3: 145, steelPerKg: 1.35, formworkPerM2: 32 },
  alder: { concretePerM3: 150, steelPerKg: 1.4, formworkPerM2: 34 },
} as const;
