// Package schema holds, in its tests only, the check of kofn's one JSON
// schema across the library packages: every result type marshals to
// lower_snake keys without "NaN" for fields that do not apply, matches the
// committed golden examples (testdata/json_schema.golden, the examples the
// README's "JSON schema" section quotes), and decodes back to an equal
// value, infinities included.
package schema
