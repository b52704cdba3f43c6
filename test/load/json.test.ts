import { describe, expect, it } from 'vitest';
import { jsonCells, parseJsonText } from '../../src/load/json.ts';

describe('jsonCells', () => {
  it('gives every value that is not an object or array its JSON path, its line and its text as written', () => {
    const text = ['{', '  "owner": { "name": "Kestrel" },', '  "energy_recovery": {', '    "electricity_efficiency": 0.20,', '    "heat_efficiency": 3e-1', '  },', '  "methods": ["cutoff", "cff"],', '  "illustrative": true', '}'].join('\n');
    const parsed = parseJsonText('declaration.json', text);
    if (!parsed.ok) throw new Error('did not parse');
    const cells = jsonCells(parsed.json);
    expect([...cells.keys()]).toEqual(['owner.name', 'energy_recovery.electricity_efficiency', 'energy_recovery.heat_efficiency', 'methods[0]', 'methods[1]', 'illustrative']);
    // As written (0.20 stays 0.20, 3e-1 stays 3e-1), on the line it is written on (1-based, as an editor numbers it).
    expect(cells.get('energy_recovery.electricity_efficiency')).toEqual({ file: 'declaration.json', line: 4, column: 'energy_recovery.electricity_efficiency', value: '0.20' });
    expect(cells.get('energy_recovery.heat_efficiency')).toMatchObject({ line: 5, value: '3e-1' });
    expect(cells.get('methods[1]')).toMatchObject({ line: 7, value: '"cff"' });
    expect(cells.get('owner.name')).toMatchObject({ line: 2, value: '"Kestrel"' });
    for (const cell of cells.values()) expect(text.split('\n')[cell.line - 1]).toContain(cell.value);
  });
});
