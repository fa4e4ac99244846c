// Editor parts monaco ships without type declarations; imported only for their side effect.
declare module 'monaco-editor/editor/contrib/suggest/browser/suggestController.js';
