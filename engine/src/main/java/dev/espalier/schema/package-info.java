/**
 * JSON Schema (draft 2020-12, with the common draft-07 forms) compiled to the shared grammar IR.
 *
 * <p>One entry point, {@link dev.espalier.schema.JsonSchemas}: a schema becomes a
 * {@link dev.espalier.grammar.Grammar} whose language is the set of JSON texts, laid out under the
 * chosen {@link dev.espalier.schema.SchemaOptions layout policy}, that the schema accepts. What cannot
 * be enforced exactly is an error ({@link dev.espalier.schema.SchemaException}) unless the caller asks
 * for leniency, in which case every relaxation is listed in the {@link dev.espalier.schema.SchemaResult}.
 *
 * <p>Inside: {@code SchemaIndex} resolves references; {@code SchemaCompiler} turns each schema
 * location into a union of {@code Facet}s (conjunctions of keywords), emits one rule per set of
 * locations and nesting depth, and renders instances by the same facets; {@code JsonText} is the
 * canonical text of values. {@link dev.espalier.schema.NumberLanguages},
 * {@link dev.espalier.schema.RegularRules} and {@link dev.espalier.schema.Formats} supply the
 * regular languages of numbers, automata and string formats.
 */
package dev.espalier.schema;
