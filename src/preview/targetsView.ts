// The targets table beside the drawing: one row per motion with the numbers
// the robot's code needs. A click on a row shows its line in the editor; the
// cursor's line is highlighted here as in the drawing; both copy buttons ask
// the host, which writes the table with the core's own CSV and Markdown.
import { readableCell, TARGET_COLUMNS as COLUMNS, type TargetTable } from '../core/targets';

export class TargetsView {
  readonly element = document.createElement('div');
  private readonly body = document.createElement('div');
  private rows: HTMLTableRowElement[] = [];

  constructor(reveal: (line: number) => void, copy: (format: 'csv' | 'markdown') => void) {
    this.element.className = 'targets';
    this.element.hidden = true;
    const actions = document.createElement('div');
    actions.className = 'targets-actions';
    for (const [label, format] of [['Copy CSV', 'csv'], ['Copy Markdown', 'markdown']] as const) {
      const b = document.createElement('button');
      b.type = 'button';
      b.textContent = label;
      b.dataset.action = `copy-${format}`;
      b.title = `Copy the table as ${format === 'csv' ? 'CSV (for a spreadsheet or your code)' : 'Markdown (for notes)'}`;
      b.addEventListener('click', () => copy(format));
      actions.append(b);
    }
    this.element.append(actions, this.body);
    this.body.addEventListener('click', (event) => {
      const row = (event.target as Element | null)?.closest?.('tr[data-line]');
      const line = Number(row?.getAttribute('data-line'));
      if (row && Number.isInteger(line) && line >= 0) reveal(line);
    });
  }

  private pending: readonly TargetTable[] | undefined;
  private highlighted: number | undefined;

  /**
   * The tables to show. Built only while the tab is visible (a 1,000-motion
   * plan makes 12,000 cells, which a render while the drawing is shown must
   * not pay for); otherwise kept until the tab is opened.
   */
  show(tables: readonly TargetTable[]): void {
    if (this.element.hidden) {
      this.pending = tables;
      return;
    }
    this.pending = undefined;
    this.build(tables);
    this.highlight(this.highlighted);
  }

  /** Called when the tab becomes visible. */
  revealed(): void {
    if (this.pending) this.show(this.pending);
  }

  private build(tables: readonly TargetTable[]): void {
    this.rows = [];
    const parts: HTMLElement[] = [];
    for (const t of tables) {
      const heading = document.createElement('h3');
      heading.textContent = t.run;
      const table = document.createElement('table');
      const head = table.createTHead().insertRow();
      for (const c of COLUMNS) {
        const th = document.createElement('th');
        th.textContent = c.header;
        th.title = c.title;
        th.scope = 'col';
        if (c.key !== 'motion') th.className = 'num';
        head.append(th);
      }
      const body = table.createTBody();
      for (const row of t.rows) {
        const tr = body.insertRow();
        // Lines are 1-based in the table and 0-based in messages.
        tr.dataset.line = String(row.line - 1);
        tr.title = 'Show this line in the plan';
        for (const c of COLUMNS) {
          const td = tr.insertCell();
          td.textContent = readableCell(row, c.key);
          if (c.key !== 'motion') td.className = 'num';
          else td.classList.add('motion');
        }
        this.rows.push(tr);
      }
      parts.push(heading, table);
    }
    if (parts.length === 0) {
      const empty = document.createElement('p');
      empty.className = 'status';
      empty.textContent = 'No motions yet: add a `start` and a `drive` or `turn`.';
      parts.push(empty);
    }
    this.body.replaceChildren(...parts);
  }

  highlight(line: number | undefined): void {
    this.highlighted = line;
    if (this.element.hidden) return;
    for (const tr of this.rows) tr.classList.toggle('is-current', line !== undefined && tr.dataset.line === String(line));
  }
}
