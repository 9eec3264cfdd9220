// CSV exports: cells that a spreadsheet would run as formulas are written as text (OWASP, "CSV
// Injection": a leading =, +, -, @, tab or carriage return), numbers stay numbers, RFC 4180 quoting;
// the caution and the run's identity lead the file as comment lines.
import { describe, expect, it } from 'vitest';
import { CAUTION_LINE } from '../../shared/api/caution';
import { csvCell, csvComments, toCsv } from '../../shared/model/csv';
import { identityLines } from '../../shared/model/export-identity';

describe('csvCell', () => {
  it('guards text that would start a formula', () => {
    expect(csvCell('=HYPERLINK("http://x","y")')).toBe(`"'=HYPERLINK(""http://x"",""y"")"`);
    expect(csvCell('+1 lane')).toBe("'+1 lane");
    expect(csvCell('-cmd')).toBe("'-cmd");
    expect(csvCell('@SUM(A1)')).toBe("'@SUM(A1)");
    expect(csvCell('\t=1')).toBe("'\t=1");
  });
  it('leaves numbers, plain text and empty cells alone', () => {
    expect(csvCell(-3.5)).toBe('-3.5');
    expect(csvCell('Market Street')).toBe('Market Street');
    expect(csvCell(null)).toBe('');
    expect(csvCell('a,b')).toBe('"a,b"');
  });
  it('writes a table with CRLF lines (RFC 4180)', () => {
    expect(toCsv(['name', 'n'], [['=x', 1]])).toBe("name,n\r\n'=x,1\r\n");
  });
});

describe('the identity lines', () => {
  it('lead with the caution and name the run and its assumptions', () => {
    const lines = identityLines({
      contents: 'Run results: curve',
      planId: 'p',
      planName: 'Veltmoor',
      dataVersion: 7,
      exportedAt: '2026-12-05T15:00:00.000Z',
      run: { id: 'r1', finishedAt: '2026-12-05T14:00:00.000Z', scenarioName: null, parameters: { horizonMinutes: 360, timeStepSeconds: 60, capacityFactor: 1, algorithm: 'auto' }, engineVersion: 'x' },
    });
    expect(lines[0]).toBe(`caution: ${CAUTION_LINE}`);
    expect(lines).toContain('run_id: r1');
    expect(lines).toContain('time_step_seconds: 60');
    expect(csvComments(lines).split('\r\n')[0]).toBe(`# caution: ${CAUTION_LINE}`);
  });
});
