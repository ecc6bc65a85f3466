// A Stryker ignorer for mutation runs (stryker.config.mjs): a list made only of sentences is prose
// (assumptions, reasons, sources shown on the methods pages), not computation. String literals are
// already excluded from mutation; this leaves out emptying such a list (`[...]` → `[]`), for the
// same reason. So is a quantity's `assumptions` list, which may also hold shared prose constants
// (SILICON_FACTS): it is shown on the pages and read by nothing that computes. A list holding names
// or anything but sentences is mutated as usual.
import { declareValuePlugin, PluginKind } from '@stryker-mutator/api/plugin';

// Prose is words: a string with a space in it. A list of names (`['etch.open_rate']`) is data.
const isProse = (node) =>
  (node.type === 'StringLiteral' && /\s/.test(node.value)) ||
  (node.type === 'TemplateLiteral' && node.quasis.some((q) => /\s/.test(q.value.cooked ?? '')));

export const strykerPlugins = [
  declareValuePlugin(PluginKind.Ignore, 'prose', {
    shouldIgnore(path) {
      const node = path.node;
      if (node.type !== 'ArrayExpression' || node.elements.length === 0) return undefined;
      if (node.elements.every((e) => e && isProse(e))) return 'a list of prose strings (string literals are not mutated either)';
      const parent = path.parent;
      if (parent?.type === 'ObjectProperty' && parent.value === node && parent.key?.type === 'Identifier' && parent.key.name === 'assumptions') {
        return 'a quantity’s assumptions: prose shown on the pages';
      }
      return undefined;
    },
  }),
];
