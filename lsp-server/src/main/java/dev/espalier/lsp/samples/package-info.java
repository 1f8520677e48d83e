/**
 * The preview of allowed tokens in sample files: the workspace file {@code espalier-samples.json}
 * ({@link dev.espalier.lsp.samples.SampleMapReader}, {@link dev.espalier.lsp.samples.SampleMap}),
 * the cache of vocabularies and compiled constraints ({@link dev.espalier.lsp.samples.PreviewCache}),
 * and the document features ({@link dev.espalier.lsp.samples.SamplePreviews}, the entry point, made
 * for a server by {@link dev.espalier.lsp.samples.SamplePreviews#features()}).
 */
package dev.espalier.lsp.samples;
