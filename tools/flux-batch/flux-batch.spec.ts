import { spawnSync } from 'child_process';
import { join } from 'path';
import { processRun } from './batch-wire';

const launcher = join(__dirname, 'launch.js');

function run(input: string, args: string[] = []) {
  const r = spawnSync(process.execPath, [launcher, ...args], { input, encoding: 'utf8', timeout: 60000 });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
}

// An invented closure: 4 L chamber on a 300 cm² collar rising 1 ppm s⁻¹ (dry) after a 20 s settle time.
const goodRun = {
  id: 'collar-7/closure-1',
  t_s: Array.from({ length: 90 }, (_, i) => i),
  co2_ppm: Array.from({ length: 90 }, (_, i) => (430 + i) * (1 - 0.01)),
  h2o_mmol_mol: 10,
  pressure_kpa: 100,
  temp_c: 20,
  volume_cm3: 4000,
  area_cm2: 300,
  settle_s: 20,
};

describe('flux:batch CLI', () => {
  it('maps a run to the snake_case result with the worked flux value of REFERENCES.md §1 (5.41564 µmol m⁻² s⁻¹)', () => {
    const r = processRun(goodRun);
    expect(r.id).toBe('collar-7/closure-1');
    expect(r.linear!.slope_ppm_s).toBeCloseTo(1, 10);
    expect(r.selected!.flux_umol_m2_s).toBeCloseTo(5.41564, 5);
    expect(r.error).toBeNull();
  });

  it('returns one result per run in input order, with invalid runs as invalid-input results', () => {
    const input = JSON.stringify({
      runs: [goodRun, { id: 'broken', t_s: [1, 2], co2_ppm: [1] }, 'not a run', { ...goodRun, id: 'second' }],
    });
    const out = run(input);
    expect(out.status).toBe(0);
    const results = JSON.parse(out.stdout).results;
    expect(results.map((x: { id: unknown }) => x.id)).toEqual(['collar-7/closure-1', 'broken', null, 'second']);
    expect(results[1].flags).toEqual(['invalid-input']);
    expect(results[1].error).toMatch(/unequal array lengths/);
    expect(results[1].linear).toBeNull();
    expect(results[2].error).toBe('run is not an object');
    expect(results[3].selected.flux_umol_m2_s).toBeCloseTo(5.41564, 5);
  }, 60000);

  it('writes non-finite numbers as null (R² of a perfectly flat closure)', () => {
    const flat = { ...goodRun, id: 'flat', co2_ppm: goodRun.co2_ppm.map(() => 420) };
    const out = run(JSON.stringify({ runs: [flat] }));
    const result = JSON.parse(out.stdout).results[0];
    expect(result.linear.r2).toBeNull();
    expect(result.flags).toContain('flat');
  }, 60000);

  it('streams --ndjson: one result line per run line, blank lines ignored', () => {
    const lines = [JSON.stringify(goodRun), '', JSON.stringify({ ...goodRun, id: 'b', settle_s: null })].join('\n');
    const out = run(lines + '\n', ['--ndjson']);
    expect(out.status).toBe(0);
    const results = out.stdout
      .trim()
      .split('\n')
      .map((l) => JSON.parse(l));
    expect(results.map((x) => x.id)).toEqual(['collar-7/closure-1', 'b']);
    expect(results[1].error).toBe('missing settle time');
  }, 60000);

  it('exits 2 with a one-line stderr message on malformed JSON', () => {
    const out = run('{"runs": [ {"id": 1,');
    expect(out.status).toBe(2);
    expect(out.stdout).toBe('');
    expect(out.stderr.trim().split('\n')).toHaveLength(1);
    expect(out.stderr).toMatch(/^flux-batch: malformed JSON/);
    const nd = run(`${JSON.stringify(goodRun)}\n{oops\n`, ['--ndjson']);
    expect(nd.status).toBe(2);
    expect(nd.stderr).toMatch(/^flux-batch: malformed JSON on line 2/);
    expect(nd.stdout.trim().split('\n')).toHaveLength(1);
  }, 60000);

  it('carries the slope basis: exponential and quadratic slopes at closure, selected.basis following "slope_at" (Kutzbach et al. 2007)', () => {
    // C(t) = 400 + 60·(1 − e^(−0.01 t)): slope 0.6 ppm/s at closure, 0.6·e^(−0.2) at the end of a 20 s settle time.
    const curved = { ...goodRun, h2o_mmol_mol: 0, t_s: Array.from({ length: 151 }, (_, i) => i) };
    curved.co2_ppm = curved.t_s.map((t) => 400 + 60 * (1 - Math.exp(-0.01 * t)));
    const byDefault = processRun(curved);
    expect(byDefault.exponential!.slope_at_closure_ppm_s).toBeCloseTo(0.6, 6);
    expect(byDefault.exponential!.slope_ppm_s).toBeCloseTo(0.6 * Math.exp(-0.2), 6);
    expect(typeof byDefault.exponential!.flux_at_closure_umol_m2_s).toBe('number');
    expect(typeof byDefault.quadratic!.slope_at_closure_ppm_s).toBe('number');
    expect(byDefault.selected!.basis).toBe('closure');
    expect(byDefault.selected!.flux_umol_m2_s).toBe(byDefault.exponential!.flux_at_closure_umol_m2_s);
    const settle = processRun({ ...curved, slope_at: 'settle_end' });
    expect(settle.selected!.basis).toBe('settle_end');
    expect(settle.selected!.flux_umol_m2_s).toBe(settle.exponential!.flux_umol_m2_s);
    const bad = processRun({ ...curved, slope_at: 'middle' });
    expect(bad.flags).toEqual(['invalid-input']);
    expect(bad.error).toMatch(/slope basis "middle"/);
  });

  it('adds the model parameters and the window with --full, and states the engine version', () => {
    const out = run(JSON.stringify({ runs: [goodRun] }), ['--full']);
    const doc = JSON.parse(out.stdout);
    expect(doc.engine_version).toMatch(/^\d+\.\d+\.\d+$/);
    expect(doc.results[0].quadratic.slope_ppm_s).toBeCloseTo(1, 8);
    expect(doc.results[0].window).toEqual({ t0_s: 20, first_t_s: 20, last_t_s: 89, n: 70 });
    const lean = JSON.parse(run(JSON.stringify({ runs: [goodRun] })).stdout).results[0];
    expect(lean.quadratic.b1).toBeUndefined();
    expect(lean.quadratic.slope_at_closure_ppm_s).toBeCloseTo(1, 8);
  }, 60000);

  it('exits 2 when the document is not {"runs": [...]}', () => {
    const out = run('[1,2,3]');
    expect(out.status).toBe(2);
    expect(out.stderr).toMatch(/expected a JSON object/);
  }, 60000);
});
