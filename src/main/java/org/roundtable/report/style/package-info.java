/** Shared look of the reports: number formatting, colours and the bundled fonts. */
package org.roundtable.report.style;
