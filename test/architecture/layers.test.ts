// The folders of src/core form layers, low to high, and a folder imports only from folders of lower layers (or from
// itself): the pipeline reads catalog -> geometry -> solver -> coverage -> export, and the orchestration on top.
// The order is declared once, in DEVELOPERS.md ("Layers of src/core"), and this test reads it from there.
// Also: src/core is pure (no DOM, React, Konva or Node built-ins), so the editor and the CLI share it.
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { builtinModules } from 'node:module';
import { join, posix, relative } from 'node:path';
import ts from 'typescript';
import { describe, expect, it } from 'vitest';

const repo = join(__dirname, '../..');
const coreRoot = join(repo, 'src/core');

/** The layer order of DEVELOPERS.md: the fenced block after the heading "Layers of src/core", one layer a line, low first. */
function declaredLayers(): string[][] {
  const text = readFileSync(join(repo, 'DEVELOPERS.md'), 'utf8');
  const m = /Layers of src\/core[^\n]*\n(?:[^\n]*\n)*?```text\n([\s\S]*?)```/.exec(text);
  if (!m) throw new Error('DEVELOPERS.md has no "Layers of src/core" section with a ```text block');
  return m[1].trim().split('\n').map((line) => line.split(',').map((s) => s.trim()).filter(Boolean));
}

/** Every import specifier of a TypeScript source: static, `import type`, `export ... from` and dynamic `import()`. */
function importSpecifiers(source: string): string[] {
  return ts.preProcessFile(source, true, true).importedFiles.map((f) => f.fileName);
}

/** The src/core folder a file (path relative to src/core, posix) belongs to; a top-level file is its own unit (`result`). */
const unitOf = (relPath: string) => {
  const parts = relPath.split('/');
  return parts.length === 1 ? parts[0].replace(/\.tsx?$/, '').replace(/\.d$/, '') : parts[0];
};

/** Violations of the layer rule by one file (path relative to src/core) with the given import specifiers. */
function layerViolations(relPath: string, specifiers: readonly string[], rank: ReadonlyMap<string, number>): string[] {
  const from = unitOf(relPath);
  const out: string[] = [];
  const fromRank = rank.get(from);
  if (fromRank === undefined) {
    return [`src/core/${relPath}: its folder "${from}" has no place in the layer order of DEVELOPERS.md; add it there`];
  }
  for (const spec of specifiers) {
    if (!spec.startsWith('.')) continue;
    const target = posix.normalize(posix.join(posix.dirname(relPath), spec));
    if (target.startsWith('..')) {
      out.push(`src/core/${relPath} imports '${spec}', outside src/core: the core depends on nothing of the CLI or the editor`);
      continue;
    }
    const to = unitOf(target);
    if (to === from) continue;
    const toRank = rank.get(to);
    if (toRank === undefined) out.push(`src/core/${relPath} imports '${spec}' from "${to}", which has no place in the layer order`);
    else if (toRank >= fromRank) {
      const how = toRank === fromRank ? 'in the same layer as' : 'in a higher layer than';
      out.push(`src/core/${relPath} imports '${spec}': "${to}" (layer ${toRank}) is ${how} "${from}" (layer ${fromRank}); `
        + 'import only from lower layers, or move the shared piece down to where its concept lives');
    }
  }
  return out;
}

/** Packages the pure core must not use: Node built-ins and the editor's UI libraries. */
const UI_PACKAGES = /^(react|react-dom|react-konva|konva|use-image|vite|playwright-core)(\/|$)/;
const nodeBuiltin = (spec: string) => spec.startsWith('node:') || builtinModules.includes(spec.split('/')[0]);

/** Globals of a browser page or of Node that the pure core must not touch. */
const IMPURE_GLOBALS = new Set(['window', 'document', 'localStorage', 'sessionStorage', 'navigator', 'HTMLElement', 'HTMLCanvasElement',
  'requestAnimationFrame', 'fetch', 'XMLHttpRequest', 'process', 'Buffer', 'require', '__dirname', '__filename']);

/** Names the file declares itself (variables, parameters, functions, imports), which shadow a global of that name. */
function declaredNames(file: ts.SourceFile): Set<string> {
  const names = new Set<string>();
  const visit = (node: ts.Node) => {
    const declares = ts.isVariableDeclaration(node) || ts.isParameter(node) || ts.isBindingElement(node) || ts.isFunctionDeclaration(node)
      || ts.isImportSpecifier(node) || ts.isImportClause(node) || ts.isClassDeclaration(node);
    if (declares && node.name && ts.isIdentifier(node.name)) names.add(node.name.text);
    ts.forEachChild(node, visit);
  };
  visit(file);
  return names;
}

/** Identifiers of the source that name an impure global (not property names such as `x.document`, object keys or locals). */
function impureGlobals(relPath: string, source: string): string[] {
  const file = ts.createSourceFile(relPath, source, ts.ScriptTarget.ES2022, true);
  const locals = declaredNames(file);
  const out: string[] = [];
  const visit = (node: ts.Node) => {
    if (ts.isIdentifier(node) && IMPURE_GLOBALS.has(node.text) && !locals.has(node.text)) {
      const p = node.parent;
      const isMemberName = (ts.isPropertyAccessExpression(p) || ts.isPropertyAssignment(p) || ts.isPropertySignature(p)
        || ts.isPropertyDeclaration(p) || ts.isMethodDeclaration(p)) && p.name === node;
      if (!isMemberName) {
        const { line } = file.getLineAndCharacterOfPosition(node.getStart());
        out.push(`src/core/${relPath}:${line + 1} uses \`${node.text}\`, a browser or Node global; keep it in src/editor or src/cli`);
      }
    }
    ts.forEachChild(node, visit);
  };
  visit(file);
  return out;
}

function coreFiles(): string[] {
  const files: string[] = [];
  const walk = (d: string) => {
    for (const n of readdirSync(d)) {
      const p = join(d, n);
      if (statSync(p).isDirectory()) walk(p);
      else if (/\.tsx?$/.test(n)) files.push(relative(coreRoot, p).split('\\').join('/'));
    }
  };
  walk(coreRoot);
  return files;
}

describe('src/core layers', () => {
  const layers = declaredLayers();
  const rank = new Map(layers.flatMap((units, i) => units.map((u) => [u, i] as const)));
  const files = coreFiles();

  it('declares each folder of src/core once, and only existing ones', () => {
    const declared = layers.flat();
    expect(new Set(declared).size).toBe(declared.length);
    const present = [...new Set(files.map(unitOf))].sort();
    expect([...declared].sort()).toStrictEqual(present);
    // The pipeline's stages keep their reading order (DEVELOPERS.md, "Layout").
    const order = ['catalog', 'geometry', 'solver', 'coverage', 'export'].map((u) => rank.get(u)!);
    expect(order).toStrictEqual([...order].sort((a, b) => a - b));
    expect(rank.get('pipeline')).toBe(layers.length - 1);
  });

  it('finds static, type-only, re-exported and dynamic imports', () => {
    const src = [
      "import { a } from '../solver/a';",
      "import type { B } from '../coverage/b';",
      "export { c } from '../export/c';",
      'const d = await import(\'../pipeline/d\');',
      "// import { e } from '../forecast/e';",
    ].join('\n');
    expect(importSpecifiers(src)).toStrictEqual(['../solver/a', '../coverage/b', '../export/c', '../pipeline/d']);
    // Each of them, from a low folder, is reported with the file and the import.
    const v = layerViolations('geometry/x.ts', importSpecifiers(src), rank);
    expect(v).toHaveLength(4);
    expect(v[0]).toContain("src/core/geometry/x.ts imports '../solver/a'");
    // Same folder and lower layers pass; a peer of the same layer does not.
    expect(layerViolations('solver/x.ts', ['./y', '../sky/frames', '../result'], rank)).toStrictEqual([]);
    expect(layerViolations('check/x.ts', ['../export/slitsCsv'], rank)).toHaveLength(1);
  });

  it('has every src/core import pointing to a lower layer or the same folder', () => {
    expect(files.length).toBeGreaterThan(100);
    const violations: string[] = [];
    let crossFolder = 0;
    for (const f of files) {
      const specs = importSpecifiers(readFileSync(join(coreRoot, f), 'utf8'));
      crossFolder += specs.filter((s) => s.startsWith('../')).length;
      violations.push(...layerViolations(f, specs, rank));
    }
    expect(crossFolder).toBeGreaterThan(300); // the scan did read the imports
    expect(violations).toStrictEqual([]);
  });

  it('keeps src/core free of DOM, React and Node', () => {
    const offenders: string[] = [];
    for (const f of files) {
      const source = readFileSync(join(coreRoot, f), 'utf8');
      for (const spec of importSpecifiers(source)) {
        if (nodeBuiltin(spec) || UI_PACKAGES.test(spec)) {
          offenders.push(`src/core/${f} imports '${spec}'; keep it in src/editor or src/cli`);
        }
      }
      offenders.push(...impureGlobals(f, source));
    }
    expect(impureGlobals('x.ts', "const w = window.innerWidth; const o = { document: 1 }; o.document;")).toHaveLength(1);
    expect(impureGlobals('x.ts', 'function f(window: number) { return window + 1; }')).toStrictEqual([]);
    expect(offenders).toStrictEqual([]);
  });
});
