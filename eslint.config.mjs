// @ts-check
import withNuxt from './.nuxt/eslint.config.mjs'

export default withNuxt(
  {
    // Short guard lines (`if (x) { where.push(…); params.x = x }`) read better kept on one line.
    rules: { '@stylistic/max-statements-per-line': ['error', { max: 3 }] },
  },
  {
    files: ['tests/**/*.ts'],
    // Tests read JSON answers whose shape is what they check.
    rules: { '@typescript-eslint/no-explicit-any': 'off' },
  },
)
