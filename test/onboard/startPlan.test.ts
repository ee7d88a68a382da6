/**
 * The editor's "start a plan" through its controller (src/editor/controller.ts, in Node with the solver replaced by a
 * recorder): a catalog and a profile given one after the other, in either order, plus the typed galaxy, draft the very
 * plan `haloweave draft` writes for the same files (byte for byte), and it opens as unsaved work with that profile.
 * What cannot be used is said by field or file, and nothing typed or given is lost. A profile edited in the editor
 * is saved beside the plan, and `haloweave plan` then `haloweave check` accept the pair.
 */
import { describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { main } from '../../src/cli/main';
import type { EditorController } from '../../src/editor/controller';
import { nodeController } from '../editor/nodeController';
import { generateScenario } from '../../src/core/scenario/generator';
import { formatDecDms, formatRaHms } from '../../src/core/sky/sexagesimal';
import { setProfileCommand } from '../../src/editor/store/commands';
import { asEditedProfile, withNumber } from '../../src/editor/panels/profileEdit';
import { demoFiles } from '../../src/editor/io/demo';
import type { StartKey } from '../../src/editor/io/startForm';

const quiet = () => ({ io: { out: () => {}, err: () => {} } });
const GALAXY = { raDeg: 203.25, decDeg: 12.4, reArcsec: 30, axisRatio: 0.7, paDeg: 120, vsysKms: 1500 };
const scenario = generateScenario({ seed: 'onboard-start', candidates: 500, alignmentStars: 120, galaxy: { ...GALAXY, id: 'Start Test', distanceMpc: 20 }, alignmentMagRange: [16, 20], instrument: 'quad8-square' });
const dir = mkdtempSync(join(tmpdir(), 'haloweave-start-'));
const catalogText = ['NAME,alpha,delta,i_total_mag,type', ...scenario.targets.map((t) => `${t.id},${(t.raDeg / 15).toFixed(8)},${t.decDeg.toFixed(7)},${t.mag},${t.role}`)].join('\n') + '\n';
writeFileSync(join(dir, 'cands.csv'), catalogText);
const shipped = JSON.parse(readFileSync(join(__dirname, '../../instrument-profiles/quad8-square.json'), 'utf8'));
const ownProfileText = JSON.stringify({ ...shipped, id: 'my-spec', label: 'my spectrograph', slits: { ...shipped.slits, widthArcsec: 1.1 } }, null, 2);
writeFileSync(join(dir, 'my-spec.json'), ownProfileText);
const form: Record<StartKey, string> = { id: 'Start Test', ra: formatRaHms(GALAXY.raDeg, 3), dec: formatDecDms(GALAXY.decDeg, 2), re: '30', q: '0.7', pa: '120', vsys: '1500', distance: '', muE: '20.8' };
const cliGalaxy = ['--id', 'Start Test', '--ra', form.ra, '--dec', form.dec, '--re', '30', '--axis-ratio', '0.7', '--pa', '120', '--vsys', '1500', '--mu-e', '20.8'];

function typeForm(c: EditorController, values: Partial<Record<StartKey, string>>) {
  for (const [k, v] of Object.entries(values)) c.setStartValue(k as StartKey, v);
}

describe('start a plan in the editor: the same plan as `haloweave draft`', () => {
  it('profile file then catalog, dropped one after the other: byte-identical to the CLI draft naming the profile file', async () => {
    const c = nodeController();
    c.openDemo(false);
    typeForm(c, form);
    await c.addStartFiles([new File([ownProfileText], 'my-spec.json')]);
    await c.addStartFiles([new File([catalogText], 'cands.csv')]);
    expect(c.start.profile?.profile.id).toBe('my-spec');
    expect(c.start.catalog?.name).toBe('cands.csv');
    expect(c.startPlan()).toBe(true);

    const planPath = join(dir, 'cands.plan.json');
    expect(await main(['draft', join(dir, 'cands.csv'), '--profile', join(dir, 'my-spec.json'), ...cliGalaxy, '--out', planPath, '--force'], quiet().io)).toBe(0);
    expect(c.start.result!.planText).toBe(readFileSync(planPath, 'utf8'));
    expect(JSON.parse(c.start.result!.planText!).instrument).toBe('my-spec.json');

    // Opened as unsaved work, on the dropped profile, with the catalog read through the guessed columns.
    const doc = c.store!.doc;
    expect(doc.plan.galaxy.id).toBe('Start Test');
    expect(doc.profile.id).toBe('my-spec');
    expect(c.store!.dirty).toBe(true);
    expect(c.session.catalog!.targets.length).toBe(scenario.targets.length);
    expect(c.start.result!.summary!.columns.join('\n')).toMatch(/ra\s+<- alpha \(by its name, hours\)/);
    expect(c.start.result!.summary!.alignment).toMatch(/alignment stars: 120 in the catalog, \d+ of mag/);
  });

  it('catalog and profile dropped together; then without the profile file, the document\'s profile by id: both as the CLI', async () => {
    writeFileSync(join(dir, 'quad8-square.json'), JSON.stringify(shipped));
    const c = nodeController();
    c.openDemo(false);
    typeForm(c, form);
    await c.addStartFiles([new File([catalogText], 'cands.csv'), new File([JSON.stringify(shipped)], 'quad8-square.json')]);
    expect(c.start.profile?.fileName).toBe('quad8-square.json');
    expect(c.startPlan()).toBe(true);
    const byFile = join(dir, 'byfile.plan.json');
    expect(await main(['draft', join(dir, 'cands.csv'), '--profile', join(dir, 'quad8-square.json'), ...cliGalaxy, '--out', byFile, '--force'], quiet().io)).toBe(0);
    expect(c.start.result!.planText).toBe(readFileSync(byFile, 'utf8'));

    // Without a profile file the document's profile (a shipped one, unchanged) is used and named by its id.
    c.clearStartProfile();
    expect(c.startPlan()).toBe(true);
    const docProfileId = c.store!.doc.profile.id;
    const byId = join(dir, 'byid.plan.json');
    expect(await main(['draft', join(dir, 'cands.csv'), '--profile', docProfileId, ...cliGalaxy, '--out', byId, '--force'], quiet().io)).toBe(0);
    expect(c.start.result!.planText).toBe(readFileSync(byId, 'utf8'));
    expect(JSON.parse(c.start.result!.planText!).instrument).toBe(docProfileId);
  });
});

describe('start a plan in the editor: what a user can get wrong', () => {
  it('missing and bad fields are named by their label, with how to fix; nothing typed is lost; no plan opens', async () => {
    const c = nodeController();
    c.openDemo(false);
    const before = c.store!.doc;
    typeForm(c, { ...form, ra: '25:00:00', q: '1.7', vsys: '' });
    expect(c.startPlan()).toBe(false);
    const text = c.start.formProblems.map((p) => `${p.where}: ${p.what} (${p.fix})`).join('\n');
    expect(text).toMatch(/start a plan: RA: .*\(the galaxy centre's RA/);
    expect(text).toMatch(/start a plan: axis ratio b\/a: 1\.7 is out of range \(the minor-to-major axis ratio, in \(0, 1\]\)/);
    expect(text).toMatch(/start a plan: velocity \(km\/s\): is empty/);
    expect(text).toMatch(/start a plan: catalog: no catalog given/);
    expect(c.start.values.ra).toBe('25:00:00');
    expect(c.start.values.re).toBe('30');
    expect(c.store!.doc).toBe(before);
  });

  it('a profile that does not validate is reported by file and key; a plan given here is refused; the catalog stays', async () => {
    const c = nodeController();
    c.openDemo(false);
    await c.addStartFiles([new File([catalogText], 'cands.csv')]);
    const broken = JSON.stringify({ ...shipped, detector: { ...shipped.detector, pixels: -5 } });
    await c.addStartFiles([new File([broken], 'bad-spec.json'), new File([demoFiles().plan.content as string], 'x.plan.json')]);
    const problems = c.start.fileProblems.map((p) => `${p.where}: ${p.what}`).join('\n');
    expect(problems).toMatch(/bad-spec\.json: detector\.pixels/);
    expect(problems).toMatch(/x\.plan\.json: is a plan file, not a catalog or a profile/);
    expect(c.start.catalog?.name).toBe('cands.csv');
    expect(c.start.profile).toBeNull();
  });

  it('a catalog of another field: a problem naming the file, the typed galaxy kept', async () => {
    const c = nodeController();
    c.openDemo(false);
    typeForm(c, { ...form, dec: '+40:00:00' });
    await c.addStartFiles([new File([catalogText], 'cands.csv')]);
    expect(c.startPlan()).toBe(false);
    expect(c.start.result!.problems[0].where).toBe('cands.csv');
    expect(c.start.result!.problems[0].what).toMatch(/no column holds Dec values near the galaxy's Dec 40\.0000 deg/);
    expect(c.start.values.dec).toBe('+40:00:00');
  });

  it('unsaved work: declining the question keeps the document and the panel as they were', async () => {
    const c = nodeController(() => false);
    c.openDemo(false);
    c.run((d) => setProfileCommand(d, { ...d.profile }));
    expect(c.store!.dirty).toBe(true);
    const before = c.store!.doc;
    typeForm(c, form);
    await c.addStartFiles([new File([catalogText], 'cands.csv')]);
    expect(c.startPlan()).toBe(false);
    expect(c.store!.doc).toBe(before);
    expect(c.start.result!.planText).not.toBeNull();
    expect(c.start.catalog?.name).toBe('cands.csv');
  });

  it('a Latin-1 catalog is read, and the panel says it was decoded as Latin-1', async () => {
    const c = nodeController();
    c.openDemo(false);
    const latin = Uint8Array.from([...'id,ra,dec,mag\nCl\xe9a,203.25,12.4,21.0\n'].map((ch) => ch.charCodeAt(0)));
    await c.addStartFiles([new File([latin], 'latin.csv')]);
    expect(c.start.fileNotes).toEqual(['latin.csv is not valid UTF-8: it was read as Latin-1 (Windows-1252); check accented names in it, or save it as UTF-8']);
    expect(String(c.start.catalog!.content)).toContain('Cléa');
    // A profile given next leaves the catalog's note; another catalog replaces it.
    await c.addStartFiles([new File([ownProfileText], 'my-spec.json')]);
    expect(c.start.fileNotes).toHaveLength(1);
    await c.addStartFiles([new File([catalogText], 'cands.csv')]);
    expect(c.start.fileNotes).toEqual([]);
    // Opened on the window for the current plan: a warning message says the same.
    await c.openFiles([new File([latin], 'latin.csv')]);
    expect(c.session.notices.map((n) => n.text)).toContain('latin.csv is not valid UTF-8: it was read as Latin-1 (Windows-1252); check accented names in it, or save it as UTF-8');
  });
});

describe('an edited profile is saved with the plan', () => {
  it('"Save plan" writes the plan naming the profile file and the file itself; plan and check accept them', async () => {
    const c = nodeController();
    c.openDemo(false);
    const original = c.store!.doc.profile;
    const edited = asEditedProfile(withNumber(original, ['slits', 'widthArcsec'], 1.2), original, [original.id]);
    c.run((d) => setProfileCommand(d, edited));
    const files = c.savedFiles();
    expect(files.map((f) => f.name)).toEqual([c.session.planName, `${edited.id}.profile.json`]);
    const out = mkdtempSync(join(tmpdir(), 'haloweave-saved-'));
    for (const f of files) writeFileSync(join(out, f.name), f.content);
    const demo = demoFiles();
    writeFileSync(join(out, demo.catalog.name), demo.catalog.content as string);
    expect(JSON.parse(files[0].content).instrument).toBe(`${edited.id}.profile.json`);
    const res = join(out, 'out');
    expect(await main(['plan', join(out, files[0].name), '--out', res, '--quiet'], quiet().io)).toBe(0);
    expect(await main(['check', res], quiet().io)).toBe(0);
    const masks = readFileSync(join(res, 'masks.csv'), 'utf8');
    expect(masks).toContain(`,${edited.id},`);
    const slits = readFileSync(join(res, 'slits.csv'), 'utf8').trim().split('\n');
    const w = slits[0].split(',').indexOf('width_arcsec'), role = slits[0].split(',').indexOf('role');
    const tracerWidths = new Set(slits.slice(1).map((l) => l.split(',')).filter((r) => r[role] === 'tracer').map((r) => Number(r[w])));
    expect([...tracerWidths]).toEqual([1.2]);
    // An unchanged shipped profile: the plan alone, naming the profile by id.
    c.undo();
    expect(c.savedFiles().map((f) => f.name)).toEqual([c.session.planName]);
  }, 240_000);
});
