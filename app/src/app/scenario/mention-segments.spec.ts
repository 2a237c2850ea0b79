import { mentionSegments } from './mention-segments';

describe('mentionSegments', () => {
  it('marks @email mentions and keeps the text around them, sentence dot included', () => {
    expect(mentionSegments('@tomas.lead@demo.kinetwin.test please check kp, cc (@Rhea@lab.test).')).toEqual([
      { text: '@tomas.lead@demo.kinetwin.test', mention: true },
      { text: ' please check kp, cc (', mention: false },
      { text: '@Rhea@lab.test', mention: true },
      { text: ').', mention: false },
    ]);
  });

  it('leaves an address without the leading @ and an e-mail inside a word alone', () => {
    expect(mentionSegments('mail ana@lab.test or x@ana@lab.test')).toEqual([{ text: 'mail ana@lab.test or x@ana@lab.test', mention: false }]);
  });

  it('marks only the addresses the server resolved to teammates when told which', () => {
    const segments = mentionSegments('@ana@lab.test and @stranger@else.test', new Set(['ana@lab.test']));
    expect(segments.filter((s) => s.mention).map((s) => s.text)).toEqual(['@ana@lab.test']);
    expect(segments.map((s) => s.text).join('')).toBe('@ana@lab.test and @stranger@else.test');
  });

  it('marks every occurrence of a repeated mention', () => {
    expect(mentionSegments('@bo@lab.test then @bo@lab.test').filter((s) => s.mention)).toHaveLength(2);
  });

  it('gives nothing for an empty body', () => {
    expect(mentionSegments('')).toEqual([]);
  });
});
