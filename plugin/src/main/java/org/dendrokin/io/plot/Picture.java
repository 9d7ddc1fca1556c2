package org.dendrokin.io.plot;

/**
 * A picture written beside a report.
 *
 * @param file    file name in the output folder
 * @param title   short title
 * @param caption one or two sentences saying what it shows
 */
public record Picture(String file, String title, String caption) {
}
