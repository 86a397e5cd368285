import { describe, expect, it } from 'vitest';
import { importButtonLabel, namesAlreadyListed } from '../../src/domain/loads/import-choice';

describe('a CSV import meeting the load list', () => {
  it('finds the file’s rows whose names are already listed, whatever their case and spacing', () => {
    const list = [{ name: 'Compressor fridge' }, { name: 'LED  lights' }];
    const rows = [
      { line: 2, name: 'compressor FRIDGE ' },
      { line: 3, name: 'Water pump' },
      { line: 4, name: 'LED lights' },
    ];
    expect(namesAlreadyListed(rows, list)).toEqual([
      { line: 2, name: 'compressor FRIDGE ' },
      { line: 4, name: 'LED lights' },
    ]);
    expect(namesAlreadyListed(rows, [])).toEqual([]);
  });

  it('says on the button what happens to the list', () => {
    expect(importButtonLabel('add', 3, 5)).toBe('Add 3 loads to the list');
    expect(importButtonLabel('replace', 1, 5)).toBe('Replace 5 loads with 1 load');
    expect(importButtonLabel('replace', 4, 0)).toBe('Import 4 loads');
  });
});
