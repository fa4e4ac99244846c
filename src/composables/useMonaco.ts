import { FORMULA_LIBRARY, FORMULA_UNITS } from '../../shared/formula/library.js';

type Monaco = typeof import('monaco-editor/editor');
type TextModel = import('monaco-editor/editor').editor.ITextModel;

/** The id of Cogbook's formula language in the editor. */
export const FORMULA_LANGUAGE = 'cogbook-formula';

/** A name a formula can read, as completion and hover show it. */
export interface ScopeName {
  name: string;
  kind: 'cell' | 'parameter' | 'value';
  /** One line: what it is ("aligned: table, 3 600 rows", "tolerance = 2 %"). */
  detail: string;
  /** Columns or fields reachable with a dot (`aligned.ref_power`). */
  fields?: { name: string; detail: string }[];
}

/** Words of the formula syntax itself (mathjs operators written as words). */
const KEYWORDS = ['and', 'or', 'not', 'xor', 'to', 'in', 'true', 'false', 'NaN', 'Infinity', 'pi', 'e'];
/** Common built-in functions offered beside Cogbook's own library. */
const BUILTINS = ['abs', 'mean', 'median', 'min', 'max', 'sum', 'std', 'round', 'sqrt', 'size', 'concat', 'string', 'number', 'filter', 'map', 'count'];

// Which names each open editor can read; set by the component that owns the model.
const scopes = new WeakMap<TextModel, () => ScopeName[]>();
let loading: Promise<Monaco> | undefined;

function registerFormulaLanguage(monaco: Monaco): void {
  const { languages } = monaco;
  languages.register({ id: FORMULA_LANGUAGE });
  languages.setLanguageConfiguration(FORMULA_LANGUAGE, {
    comments: { lineComment: '#' },
    brackets: [['(', ')'], ['[', ']'], ['{', '}']],
    autoClosingPairs: [
      { open: '(', close: ')' },
      { open: '[', close: ']' },
      { open: '{', close: '}' },
      { open: '"', close: '"' },
    ],
  });
  languages.setMonarchTokensProvider(FORMULA_LANGUAGE, {
    keywords: KEYWORDS,
    library: FORMULA_LIBRARY.map((f) => f.name),
    builtins: BUILTINS,
    tokenizer: {
      root: [
        [/#.*$/, 'comment'],
        [/"([^"\\]|\\.)*"/, 'string'],
        [/'([^'\\]|\\.)*'/, 'string'],
        [/\d+(\.\d+)?([eE][+-]?\d+)?/, 'number'],
        [/\.[A-Za-z_][A-Za-z0-9_]*/, 'type.identifier'],
        [/[A-Za-z_][A-Za-z0-9_]*(?=\s*\()/, { cases: { '@library': 'keyword.function', '@builtins': 'predefined', '@default': 'identifier' } }],
        [/[A-Za-z_][A-Za-z0-9_]*/, { cases: { '@keywords': 'keyword', '@default': 'variable' } }],
        [/[=<>!]=|[-+*/^%<>=!]|\.\*|\.\/|\.\^/, 'operator'],
      ],
    },
  });

  languages.registerCompletionItemProvider(FORMULA_LANGUAGE, {
    triggerCharacters: ['.'],
    provideCompletionItems(model, position) {
      const scope = scopes.get(model)?.() ?? [];
      const word = model.getWordUntilPosition(position);
      const range = { startLineNumber: position.lineNumber, endLineNumber: position.lineNumber, startColumn: word.startColumn, endColumn: word.endColumn };
      const before = model.getLineContent(position.lineNumber).slice(0, word.startColumn - 1);
      const owner = /([A-Za-z_][A-Za-z0-9_]*)\.$/.exec(before)?.[1];
      const Kind = languages.CompletionItemKind;
      if (owner !== undefined) {
        const fields = scope.find((s) => s.name === owner)?.fields ?? [];
        return { suggestions: fields.map((f) => ({ label: f.name, kind: Kind.Field, detail: f.detail, insertText: f.name, range })) };
      }
      return {
        suggestions: [
          ...scope.map((s) => ({
            label: s.name,
            kind: s.kind === 'cell' ? Kind.Module : s.kind === 'parameter' ? Kind.Constant : Kind.Variable,
            detail: s.detail,
            insertText: s.name,
            range,
            sortText: `0${s.name}`,
          })),
          ...FORMULA_LIBRARY.map((f) => ({
            label: f.name,
            kind: Kind.Function,
            detail: f.signature,
            documentation: { value: `${f.doc}\n\n\`${f.example}\`` },
            insertText: `${f.name}($0)`,
            insertTextRules: languages.CompletionItemInsertTextRule.InsertAsSnippet,
            range,
            sortText: `1${f.name}`,
          })),
          ...BUILTINS.map((b) => ({ label: b, kind: Kind.Function, detail: 'built in', insertText: b, range, sortText: `2${b}` })),
          ...FORMULA_UNITS.filter((u) => /^[A-Za-z]+$/.test(u.unit)).map((u) => ({ label: u.unit, kind: Kind.Unit, detail: u.doc, insertText: u.unit, range, sortText: `3${u.unit}` })),
        ],
      };
    },
  });

  languages.registerHoverProvider(FORMULA_LANGUAGE, {
    provideHover(model, position) {
      const word = model.getWordAtPosition(position);
      if (!word) return null;
      const range = { startLineNumber: position.lineNumber, endLineNumber: position.lineNumber, startColumn: word.startColumn, endColumn: word.endColumn };
      const fn = FORMULA_LIBRARY.find((f) => f.name === word.word);
      if (fn) return { range, contents: [{ value: `**${fn.signature}**` }, { value: fn.doc }, { value: `Example: \`${fn.example}\`` }] };
      const before = model.getLineContent(position.lineNumber).slice(0, word.startColumn - 1);
      const owner = /([A-Za-z_][A-Za-z0-9_]*)\.$/.exec(before)?.[1];
      const scope = scopes.get(model)?.() ?? [];
      if (owner !== undefined) {
        const field = scope.find((s) => s.name === owner)?.fields?.find((f) => f.name === word.word);
        return field ? { range, contents: [{ value: `**${owner}.${field.name}**` }, { value: field.detail }] } : null;
      }
      const name = scope.find((s) => s.name === word.word);
      if (name) return { range, contents: [{ value: `**${name.name}**` }, { value: name.detail }] };
      const unit = FORMULA_UNITS.find((u) => u.unit === word.word);
      return unit ? { range, contents: [{ value: `**${unit.unit}**: ${unit.doc}` }] } : null;
    },
  });

  languages.registerSignatureHelpProvider(FORMULA_LANGUAGE, {
    signatureHelpTriggerCharacters: ['(', ','],
    provideSignatureHelp(model, position) {
      const text = model.getValueInRange({ startLineNumber: position.lineNumber, startColumn: 1, endLineNumber: position.lineNumber, endColumn: position.column });
      // The innermost unclosed call on this line.
      let depth = 0;
      let commas = 0;
      for (let i = text.length - 1; i >= 0; i--) {
        const c = text[i];
        if (c === ')') depth++;
        else if (c === ',' && depth === 0) commas++;
        else if (c === '(') {
          if (depth > 0) {
            depth--;
            continue;
          }
          const name = /([A-Za-z_][A-Za-z0-9_]*)\s*$/.exec(text.slice(0, i))?.[1];
          const fn = FORMULA_LIBRARY.find((f) => f.name === name);
          if (!fn) return null;
          const params = fn.signature.slice(fn.signature.indexOf('(') + 1, -1).split(',').map((p) => ({ label: p.trim() }));
          return { value: { signatures: [{ label: fn.signature, documentation: fn.doc, parameters: params }], activeSignature: 0, activeParameter: Math.min(commas, params.length - 1) }, dispose() {} };
        }
      }
      return null;
    },
  });

  monaco.editor.defineTheme('cogbook', {
    base: 'vs',
    inherit: true,
    rules: [
      { token: 'keyword.function', foreground: '8F3F12', fontStyle: 'bold' },
      { token: 'predefined', foreground: '2A2F39', fontStyle: 'bold' },
      { token: 'keyword', foreground: '7A4CA0' },
      { token: 'variable', foreground: '0B5394' },
      { token: 'type.identifier', foreground: '2F7D4F' },
      { token: 'number', foreground: '9A6700' },
      { token: 'comment', foreground: '667080', fontStyle: 'italic' },
    ],
    // Line numbers and comments are text too: at least 4.5:1 on the white editor (WCAG AA).
    colors: { 'editor.background': '#FFFFFF', 'editorLineNumber.foreground': '#667080', 'editorLineNumber.activeForeground': '#2A2F39' },
  });
}

async function loadMonaco(): Promise<Monaco> {
  const [monaco, { default: EditorWorker }] = await Promise.all([
    import('monaco-editor/editor'),
    import('monaco-editor/editor/editor.worker?worker'),
    import('monaco-editor/features/hover/register.js'),
    import('monaco-editor/features/suggest/register.js'),
    import('monaco-editor/editor/contrib/suggest/browser/suggestController.js'),
    import('monaco-editor/features/snippet/register.js'),
    import('monaco-editor/features/parameterHints/register.js'),
    import('monaco-editor/features/bracketMatching/register.js'),
    import('monaco-editor/features/comment/register.js'),
    import('monaco-editor/features/wordHighlighter/register.js'),
  ]);
  // Without this, the built app would try a data: URL worker, which the page policy blocks.
  (self as unknown as { MonacoEnvironment: object }).MonacoEnvironment = { getWorker: () => new EditorWorker() };
  registerFormulaLanguage(monaco);
  return monaco;
}

/**
 * The code editor, loaded on first use (it is megabytes of script, so it stays out of
 * the notebook's first paint), with Cogbook's formula language: tokens, completion of
 * names in scope and of the function library, hover help and signature hints.
 */
export function useMonaco() {
  return {
    load: (): Promise<Monaco> => (loading ??= loadMonaco()),
    /** Tells completion and hover which names the formula in `model` can read. */
    setScope: (model: TextModel, scope: () => ScopeName[]) => scopes.set(model, scope),
  };
}
