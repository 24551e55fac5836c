import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { CALC_VERSION } from '../../server/calc/version.js';
import { Client, signIn, startTestApp, type TestApp } from './harness.js';

// The Hill 1948 calculator endpoints. Expected values:
//  - isotropy: free neck at arctan √2 = 54.7356° from the tensile axis, and at that neck angle the
//    relative displacement at 90° − 54.7356° = 35.2644° (R. Hill, J. Mech. Phys. Solids 1 (1952) 19–30);
//  - r0 = H/G, r90 = H/F, r45 = N/(F + G) − 1/2 (R. Hill, Proc. R. Soc. Lond. A 193 (1948) 281–297);
//  - normal anisotropy: tan²ψ = (1 + r)/r (Hill 1952).

const PSI_ISO = (Math.atan(Math.SQRT2) * 180) / Math.PI; // 54.7356103172° = arctan √2 (Hill 1952)

let t: TestApp;
let engineer: Client;
let supervisor: Client;

beforeAll(async () => {
  t = await startTestApp();
  engineer = await signIn(t.app, 'engineer');
  supervisor = await signIn(t.app, 'supervisor');
});
afterAll(() => t.close());

describe('POST /api/calc/hill48', () => {
  it('turns the isotropic triple r = 1 into F = G = H = 1/2, N = 3/2 with the free neck at 54.74°', async () => {
    const res = await engineer.post('/api/calc/hill48', { from: 'lankford', lankford: { r0: 1, r45: 1, r90: 1 } });
    expect(res.status).toBe(200);
    // Hill 1948 isotropy under G + H = 1: F = G = H = 1/2, N = 3/2
    expect(res.body.coefficients.F).toBeCloseTo(0.5, 14);
    expect(res.body.coefficients.G).toBeCloseTo(0.5, 14);
    expect(res.body.coefficients.H).toBeCloseTo(0.5, 14);
    expect(res.body.coefficients.N).toBeCloseTo(1.5, 14);
    // Hill 1952: ψ = arctan √2 and φ = 90° − ψ
    expect(res.body.freeNeck.neckAnglesDeg[0]).toBeCloseTo(PSI_ISO, 10);
    expect(res.body.freeNeck.relativeDisplacementAnglesDeg[0]).toBeCloseTo(90 - PSI_ISO, 10);
    expect(res.body.calcVersion).toBe(CALC_VERSION);
    expect(res.body.assumptions.join(' ')).toMatch(/plane stress/i);
    expect(res.body.cautions.join(' ')).toMatch(/not standard tensile specimens/);
    // The Hill locus of an isotropic set is the von Mises locus, point by point (same sampling).
    const { hill, vonMises } = res.body.locus as { hill: { s1: number; s2: number }[]; vonMises: { s1: number; s2: number }[] };
    expect(hill.length).toBe(vonMises.length);
    hill.forEach((p, i) => expect(Math.hypot(p.s1 - vonMises[i]!.s1, p.s2 - vonMises[i]!.s2)).toBeLessThan(1e-12));
  });

  it.each([
    [1.8, 1.2, 2.2],
    [0.6, 1.4, 0.9],
    [2.5, 0.4, 3.1],
  ])('round-trips r0 = %s, r45 = %s, r90 = %s through F, G, H, N (Hill 1948 relations)', async (r0, r45, r90) => {
    const there = await engineer.post('/api/calc/hill48', { from: 'lankford', lankford: { r0, r45, r90 } });
    expect(there.status).toBe(200);
    const c = there.body.coefficients;
    // Hill 1948: r0 = H/G, r90 = H/F, r45 = N/(F+G) − 1/2, with G + H = 1 by our normalisation
    expect(c.G + c.H).toBeCloseTo(1, 14);
    expect(c.H / c.G).toBeCloseTo(r0, 12);
    expect(c.H / c.F).toBeCloseTo(r90, 12);
    expect(c.N / (c.F + c.G) - 0.5).toBeCloseTo(r45, 12);
    const back = await engineer.post('/api/calc/hill48', { from: 'coefficients', coefficients: c });
    expect(back.body.lankford.r0).toBeCloseTo(r0, 12);
    expect(back.body.lankford.r45).toBeCloseTo(r45, 12);
    expect(back.body.lankford.r90).toBeCloseTo(r90, 12);
    // Hill 1952, tension along RD: tan²ψ = (1 + r0)/r0
    const psi = (Math.atan(Math.sqrt((1 + r0) / r0)) * 180) / Math.PI;
    expect(there.body.freeNeck.neckAnglesDeg[0]).toBeCloseTo(psi, 10);
  });

  it('refuses a negative Lankford coefficient and a non-convex locus with 400 naming the value', async () => {
    const neg = await engineer.post('/api/calc/hill48', { from: 'lankford', lankford: { r0: -0.5, r45: 1, r90: 1 } });
    expect(neg.status).toBe(400);
    expect(neg.body.message).toMatch(/r0 = -0\.5 is not admissible/);
    // F = G = -0.5, H = 1.5: FG + GH + HF = 0.25 − 1.5 < 0, an open locus (positive definiteness, common practice, no source)
    const open = await engineer.post('/api/calc/hill48', { from: 'coefficients', coefficients: { F: -0.5, G: -0.5, H: 1.5, N: 1.5 } });
    expect(open.status).toBe(400);
    expect(open.body.message).toMatch(/FG \+ GH \+ HF = -1\.25/);
    const missing = await engineer.post('/api/calc/hill48', { from: 'lankford', lankford: { r0: 1, r45: 1 } });
    expect(missing.status).toBe(400);
    expect(missing.body.message).toMatch(/r90/);
  });

  it('needs a signed-in user', async () => {
    const anon = await request(t.app).post('/api/calc/hill48').send({ from: 'lankford', lankford: { r0: 1, r45: 1, r90: 1 } });
    // CSRF or sign-in refuses first; either way nothing is computed for an anonymous caller.
    expect([401, 403]).toContain(anon.status);
    expect((await supervisor.post('/api/calc/hill48', { from: 'lankford', lankford: { r0: 1, r45: 1, r90: 1 } })).status).toBe(200);
  });
});

describe('POST /api/calc/neck-angle and /api/calc/h-from-angle', () => {
  const ISO = { F: 0.5, G: 0.5, H: 0.5, N: 1.5 };

  it('predicts 35.26° at the isotropic free-neck angle and solves H = 1/2 back from it', async () => {
    const fwd = await engineer.post('/api/calc/neck-angle', { coefficients: ISO, neckAngleDeg: PSI_ISO });
    expect(fwd.status).toBe(200);
    // Hill 1952: at the free-neck angle of an isotropic sheet, φ = 90° − ψ = 35.2644°
    expect(fwd.body.relativeDisplacementAngleDeg).toBeCloseTo(90 - PSI_ISO, 10);
    expect(fwd.body.thinning).toBeGreaterThan(0);
    const inv = await engineer.post('/api/calc/h-from-angle', { neckAngleDeg: PSI_ISO, relativeDisplacementAngleDeg: 90 - PSI_ISO, assumption: { kind: 'given-FGN', F: 0.5, G: 0.5, N: 1.5 } });
    expect(inv.status).toBe(200);
    expect(inv.body.H).toBeCloseTo(0.5, 10);
    const normal = await engineer.post('/api/calc/h-from-angle', { neckAngleDeg: PSI_ISO, relativeDisplacementAngleDeg: 90 - PSI_ISO, assumption: { kind: 'normal-anisotropy' } });
    // Normal anisotropy with r = 1 is isotropy: H = r/(1 + r) = 1/2 (Hill 1948 with G + H = 1)
    expect(normal.body.r).toBeCloseTo(1, 10);
    expect(normal.body.H).toBeCloseTo(0.5, 10);
    expect(normal.body.admissibleAngleRangeDeg[0]).toBeLessThan(90 - PSI_ISO);
  });

  it.each([0.5, 2, 3])('normal anisotropy r = %s: the angle predicted at an imposed 60° neck solves back to r', async (r) => {
    // Forward/inverse consistency (issue 7 checks): F = G = 1/(1+r), H = r/(1+r), N = (2r+1)/(1+r) (Hill 1948)
    const c = { F: 1 / (1 + r), G: 1 / (1 + r), H: r / (1 + r), N: (2 * r + 1) / (1 + r) };
    const fwd = await engineer.post('/api/calc/neck-angle', { coefficients: c, neckAngleDeg: 60 });
    const inv = await engineer.post('/api/calc/h-from-angle', { neckAngleDeg: 60, relativeDisplacementAngleDeg: fwd.body.relativeDisplacementAngleDeg, assumption: { kind: 'normal-anisotropy' } });
    expect(inv.body.r).toBeCloseTo(r, 10);
  });

  it('refuses an angle that admits no positive H, and an out-of-range neck angle, with 400 and the reason', async () => {
    // A thinning neck needs φ < θ (NECK-THEORY.md §4, from Hill 1952's band kinematics)
    const none = await engineer.post('/api/calc/h-from-angle', { neckAngleDeg: 30, relativeDisplacementAngleDeg: 40, assumption: { kind: 'normal-anisotropy' } });
    expect(none.status).toBe(400);
    expect(none.body.message).toMatch(/relativeDisplacementAngleDeg = 40° admits no positive r at θ = 30°/);
    const given = await engineer.post('/api/calc/h-from-angle', { neckAngleDeg: 60, relativeDisplacementAngleDeg: 70, assumption: { kind: 'given-FGN', F: 0.4, G: 0.5, N: 1.4 } });
    expect(given.status).toBe(400);
    expect(given.body.message).toMatch(/admits no positive H/);
    const theta = await engineer.post('/api/calc/neck-angle', { coefficients: ISO, neckAngleDeg: 180 });
    expect(theta.status).toBe(400);
    expect(theta.body.message).toMatch(/neckAngleDeg = 180° is outside \(0°, 180°\)/);
    const perpendicular = await engineer.post('/api/calc/h-from-angle', { neckAngleDeg: 90, relativeDisplacementAngleDeg: 0, assumption: { kind: 'normal-anisotropy' } });
    expect(perpendicular.status).toBe(400);
    expect(perpendicular.body.message).toMatch(/perpendicular to the load/);
  });
});
