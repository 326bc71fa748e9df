/**
 * Result intake: reads a laboratory's result upload (CSV, XLSX or JSON) into typed results, all or nothing.
 *
 * <h2>Entry point</h2>
 * {@link org.roundtable.submission.intake.ResultIntake#read(byte[], UploadFormat, UploadRules)} returns an
 * {@link org.roundtable.submission.intake.IntakeResult}: {@code Accepted} (every result, warnings to confirm, what was
 * detected, canonical JSON and its SHA-256) or {@code Rejected} (every problem with row, column, value, a stable key
 * from {@link org.roundtable.submission.intake.IntakeKey} and a plain message). Nothing is stored here: the package
 * has no database, web or framework dependency (checked by an ArchUnit test), only Java, Commons CSV, Apache POI and
 * Jackson.
 *
 * <h2>Upload format (our own)</h2>
 * CSV and XLSX: a header row with named columns in any order, names compared without regard to case
 * (see {@link org.roundtable.submission.intake.UploadColumn}), then one row per result:
 * <pre>
 * measurand,item,value,unit,expanded_uncertainty,coverage_factor,method,replicates,replicate_values
 * Mn,A,1.215,%,0.030,2,spark-oes,3,1.210|1.215|1.220
 * S,A,&lt;0.002,%,,,combustion,2,
 * N,A,85,mg/kg,6,2,inert-gas-fusion,2,84|86
 * </pre>
 * CSV: UTF-8 with or without byte order mark; comma or semicolon delimiter, detected on the header line; decimal comma
 * only with the semicolon delimiter; quotes as in RFC 4180. XLSX: the first sheet, the header is its first non-blank
 * row. JSON: {@code {"results":[{"measurand":"Mn","item":"A","value":"1.215","unit":"%",
 * "expandedUncertainty":"0.030","coverageFactor":"2","method":"spark-oes","replicates":3,
 * "replicateValues":["1.210","1.215","1.220"]}]}}.
 *
 * <h2>Rules</h2>
 * <ul>
 *   <li>Errors (reject the upload): not a number, NaN/infinity, exponent notation, negative, above 100 %
 *       (1 000 000 mg/kg), unknown element (symbols H … U), element not in the round, unit not recognised or not
 *       allowed, method group unknown or not allowed, "less than" where not allowed, U ≤ 0, k outside 1 … 4, replicate
 *       count outside 1 … maximum or not matching the replicate values, the same measurand twice for an item, a cell
 *       starting with {@code = + - @}, tab or CR (formula injection; a negative number is {@code value.negative}),
 *       control characters, cells over 256 characters.</li>
 *   <li>Warnings (the laboratory confirms): value outside the expected range (a unit slip must reach the evaluation
 *       and show there as an outlier), U larger than the value, decimals differing from those requested, a measurand
 *       of the round not reported.</li>
 *   <li>Limits: {@link org.roundtable.submission.intake.Limits} (2 MiB, 5 000 rows, 4 096-character lines, 256-character
 *       cells, 200 zip entries, 20 MiB unpacked, inflate ratio ≥ 0.01).</li>
 *   <li>XLSX refused: zip bombs, too many entries, unsafe entry names, macros, ActiveX and embedded objects, external
 *       links, DOCTYPE declarations (XXE), encrypted workbooks, legacy .xls, anything that is not an OOXML workbook.</li>
 * </ul>
 * Units: 1 % = 10 000 mg/kg, converted exactly with {@link java.math.BigDecimal}.
 */
package org.roundtable.submission.intake;
