/** The catalog's row report: every row that was not used, with its line, column and reason. */
import { memo } from 'react';
import type { CatalogReadResult } from '../../core/catalog/types';
import { Panel } from './Panel';

/** Memoised on the catalog it reports: a drag preview (not an edit) does not re-render it. */
export const RejectReport = memo(function RejectReport({ catalog, name, reveal = 0 }: { catalog: CatalogReadResult; name: string; reveal?: number }) {
  const rejects = [...catalog.rejects].sort((a, b) => a.line - b.line);
  const rows = new Set(rejects.map((r) => r.line)).size;
  return (
    <Panel title={`Catalog rows not used (${rows})`} testId="panel-rejects" reveal={reveal}>
      <div className="small" data-testid="catalog-summary">
        {name} ({catalog.format}): {catalog.rowsRead} rows read, <span data-testid="catalog-used">{catalog.targets.length}</span> used,{' '}
        <span data-testid="catalog-rejected">{rows}</span> not used
      </div>
      {rejects.length > 0 && (
        <div className="reject-box">
          <table className="mini" data-testid="reject-report">
            <thead><tr><th>line</th><th>column</th><th>reason</th></tr></thead>
            <tbody>
              {rejects.slice(0, 500).map((r, i) => (
                <tr key={i} data-testid="reject-row"><td className="num">{r.line}</td><td>{r.column}</td><td>{r.reason}</td></tr>
              ))}
            </tbody>
          </table>
          {rejects.length > 500 && <div className="dim small">… and {rejects.length - 500} more (all of them in catalog-report.csv)</div>}
        </div>
      )}
    </Panel>
  );
});
