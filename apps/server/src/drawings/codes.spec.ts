import { nextDrawingNumber, revisionCode } from './codes';

describe('revision codes', () => {
  // ISO 19650-2 national annex practice: P01… for shared (preliminary), C01… for published (contractual).
  it('numbers ISO 19650 revisions P01, P02 … then C01 …', () => {
    expect([1, 2, 10].map((n) => revisionCode('iso19650', 'preliminary', n))).toEqual(['P01', 'P02', 'P10']);
    expect(revisionCode('iso19650', 'contractual', 1)).toBe('C01');
    expect(() => revisionCode('iso19650', 'preliminary', 100)).toThrow(RangeError);
  });

  // Common practice: letters while preliminary (I and O left out), then 0, 1, 2 … once contractual.
  it('numbers the older convention A, B … (no I or O) then 0, 1 …', () => {
    expect([1, 2, 8, 9, 14].map((n) => revisionCode('letters_numbers', 'preliminary', n))).toEqual([
      'A',
      'B',
      'H',
      'J',
      'P',
    ]);
    expect(revisionCode('letters_numbers', 'preliminary', 25)).toBe('AA');
    expect([1, 2, 3].map((n) => revisionCode('letters_numbers', 'contractual', n))).toEqual(['0', '1', '2']);
  });
});

describe('next drawing number', () => {
  it('proposes one more than the highest sequence that fits the pattern', () => {
    expect(nextDrawingNumber('S-{seq:3}', 'SQ-1', [])).toBe('S-001');
    expect(nextDrawingNumber('S-{seq:3}', 'SQ-1', ['S-001', 'S-104', 'S-007', 'A-900', 'S-1x'])).toBe('S-105');
  });

  it('fills in the project reference and keeps text after the sequence', () => {
    const pattern = '{project}-SQS-ZZ-00-DR-S-{seq:4}';
    expect(nextDrawingNumber(pattern, 'KY14', ['KY14-SQS-ZZ-00-DR-S-0012'])).toBe('KY14-SQS-ZZ-00-DR-S-0013');
    expect(nextDrawingNumber('GA{seq:2}.X', 'P', ['GA09.X', 'ga10.x'])).toBe('GA11.X');
  });
});
