// The caution shown in help texts; the README carries the same words.
export const CAUTION = `Caution: in a confirmatory or clinical study the multiplicity strategy (which
hypotheses, which families, which procedure, which alpha) is fixed in advance in
the protocol or statistical analysis plan. famwise computes what you ask for; it
does not decide what is appropriate. The study's pre-specified plan, regulators'
guidance and a qualified statistician decide.`;
