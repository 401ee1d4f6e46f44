interface RuleSetSummary { clauses: Array<{ id: string, title: string }> }

/** Clause titles by id from the rulebook, for findings; a finding falls back to its clause id. */
export function useClauseTitles() {
  const { data } = useFetch('/api/rules', {
    key: 'rules-titles',
    lazy: true,
    // Keep only what findings need, so the page payload stays small.
    transform: (sets: RuleSetSummary[]): Record<string, string> => Object.fromEntries(sets.flatMap(s => s.clauses.map(c => [c.id, c.title]))),
  })
  return (id: string) => data.value?.[id] ?? id
}
