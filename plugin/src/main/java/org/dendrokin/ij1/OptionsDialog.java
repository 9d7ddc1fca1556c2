package org.dendrokin.ij1;

import java.awt.GraphicsEnvironment;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Locale;
import java.util.Set;

import ij.Macro;
import ij.Prefs;
import ij.gui.DialogListener;
import ij.gui.GenericDialog;

import org.dendrokin.io.InputException;

/**
 * A command's dialog. With a display it is an ImageJ {@link GenericDialog}, so the macro recorder records
 * it and a macro's options string fills it without showing it. Without a display (ImageJ in headless or
 * {@code -batch} mode on a server) the same fields are read from the options string with ImageJ's own
 * rules: the key is the label's first word in lower case, a check box is on when its key is present.
 * Values the user confirms are remembered in ImageJ's preferences under {@code dendrokin.<command>.<key>}
 * and offered next time; runs driven by a macro neither read nor change them, so a macro gives the same
 * result on every machine.
 */
public final class OptionsDialog {
    private final String prefix;
    private final String title;
    private final String options;
    private final GenericDialog dialog;
    private final List<Field> fields = new ArrayList<>();
    private final Set<String> keys = new HashSet<>();
    private final int[] taken = new int[Kind.values().length];

    private enum Kind { NUMBER, TEXT, CHOICE, CHECK }

    private record Field(Kind kind, String key, String fallback, boolean remembered) {
        Field(Kind kind, String key, String fallback) {
            this(kind, key, fallback, true);
        }
    }

    /**
     * @param command the command's name, used as the dialog title
     * @param prefsId short identifier under which the values are remembered, e.g. {@code "kymograph"}
     */
    public OptionsDialog(String command, String prefsId) {
        this.title = command;
        this.prefix = "dendrokin." + prefsId + ".";
        this.options = Macro.getOptions();
        this.dialog = GraphicsEnvironment.isHeadless() ? null : new GenericDialog(command);
    }

    /** True when a macro or script supplied the options, so no dialog is shown. */
    public boolean fromMacro() {
        return options != null;
    }

    /** True when ImageJ runs without a display. */
    public static boolean headless() {
        return GraphicsEnvironment.isHeadless();
    }

    /** A number field; the label should name the unit, e.g. {@code "Band width (um)"}. */
    public OptionsDialog number(String label, double defaultValue, int digits) {
        return number(label, defaultValue, digits, true);
    }

    /**
     * A number field that offers the last confirmed value only when {@code remembered}; values read from the
     * image (pixel size, frame interval, line width) are not remembered, since last time's value would silently
     * change the result for another image.
     */
    public OptionsDialog number(String label, double defaultValue, int digits, boolean remembered) {
        String key = key(label);
        double shown = fromMacro() || !remembered ? defaultValue : Prefs.get(prefix + key, defaultValue);
        fields.add(new Field(Kind.NUMBER, key, Double.toString(defaultValue), remembered));
        if (dialog != null) {
            dialog.addNumericField(label, shown, digits);
        }
        return this;
    }

    /** A text field. */
    public OptionsDialog text(String label, String defaultValue, int columns) {
        return text(label, defaultValue, columns, true);
    }

    /**
     * A text field that offers the last confirmed value only when {@code remembered}; a setting meant for one run
     * (such as a stimulus spot) is not remembered, so that it cannot carry over to the next session unseen.
     */
    public OptionsDialog text(String label, String defaultValue, int columns, boolean remembered) {
        String key = key(label);
        String shown = fromMacro() || !remembered ? defaultValue : Prefs.get(prefix + key, defaultValue);
        fields.add(new Field(Kind.TEXT, key, defaultValue, remembered));
        if (dialog != null) {
            dialog.addStringField(label, shown, columns);
        }
        return this;
    }

    /** A file field with a Browse button. */
    public OptionsDialog file(String label, String defaultValue) {
        String key = key(label);
        String shown = fromMacro() ? defaultValue : Prefs.get(prefix + key, defaultValue);
        fields.add(new Field(Kind.TEXT, key, defaultValue));
        if (dialog != null) {
            dialog.addFileField(label, shown, 40);
        }
        return this;
    }

    /** A folder field with a Browse button. */
    public OptionsDialog folder(String label, String defaultValue) {
        String key = key(label);
        String shown = fromMacro() ? defaultValue : Prefs.get(prefix + key, defaultValue);
        fields.add(new Field(Kind.TEXT, key, defaultValue));
        if (dialog != null) {
            dialog.addDirectoryField(label, shown, 40);
        }
        return this;
    }

    /** A drop-down list. */
    public OptionsDialog choice(String label, String[] items, String defaultItem) {
        return choice(label, items, defaultItem, true);
    }

    /** A drop-down list that offers the last confirmed item only when {@code remembered}. */
    public OptionsDialog choice(String label, String[] items, String defaultItem, boolean remembered) {
        String key = key(label);
        String shown = fromMacro() || !remembered ? defaultItem : Prefs.get(prefix + key, defaultItem);
        if (!List.of(items).contains(shown)) {
            shown = defaultItem;
        }
        fields.add(new Field(Kind.CHOICE, key, defaultItem, remembered));
        if (dialog != null) {
            dialog.addChoice(label, items, shown);
        }
        return this;
    }

    /** A check box. */
    public OptionsDialog check(String label, boolean defaultValue) {
        String key = key(label);
        boolean shown = fromMacro() ? defaultValue : Prefs.get(prefix + key, defaultValue);
        fields.add(new Field(Kind.CHECK, key, Boolean.toString(defaultValue)));
        if (dialog != null) {
            dialog.addCheckbox(label, shown);
        }
        return this;
    }

    /** A line of explanation (not a field; not recorded). */
    public OptionsDialog message(String text) {
        if (dialog != null) {
            dialog.addMessage(text);
        }
        return this;
    }

    /** Listens to changes while the dialog is open, e.g. to preview the band on the image. */
    public OptionsDialog onChange(DialogListener listener) {
        if (dialog != null) {
            dialog.addDialogListener(listener);
        }
        return this;
    }

    /** The underlying ImageJ dialog, or null without a display. */
    public GenericDialog generic() {
        return dialog;
    }

    /**
     * Shows the dialog (or reads the macro's options) and returns false if the user cancelled it.
     *
     * @throws InputException without a display and without an options string: nobody could answer
     */
    public boolean show() {
        if (dialog == null) {
            if (options == null) {
                throw new InputException(null, title + " needs its options (e.g. from a macro) when ImageJ runs"
                        + " without a display");
            }
            return true;
        }
        dialog.showDialog();
        return !dialog.wasCanceled();
    }

    /** The next number field's value; NaN if it is not a number. */
    public double nextNumber() {
        Field f = take(Kind.NUMBER);
        double v;
        if (dialog != null) {
            v = dialog.getNextNumber();
        } else {
            v = parse(Macro.getValue(options, f.key, f.fallback), f.key);
        }
        remember(f, Double.toString(v));
        return v;
    }

    /** The next text, file or folder field's value. */
    public String nextText() {
        Field f = take(Kind.TEXT);
        String v = dialog != null ? dialog.getNextString() : Macro.getValue(options, f.key, f.fallback);
        remember(f, v);
        return v.trim();
    }

    /** The next choice's selected item. */
    public String nextChoice() {
        Field f = take(Kind.CHOICE);
        String v = dialog != null ? dialog.getNextChoice() : Macro.getValue(options, f.key, f.fallback);
        remember(f, v);
        return v;
    }

    /** The next check box's state. */
    public boolean nextCheck() {
        Field f = take(Kind.CHECK);
        boolean v = dialog != null ? dialog.getNextBoolean() : hasFlag(options, f.key);
        remember(f, Boolean.toString(v));
        return v;
    }

    /** Option keys of the fields added so far, in order; documented in docs/imagej.md. */
    public List<String> keys() {
        return fields.stream().map(Field::key).toList();
    }

    private String key(String label) {
        String key = Macro.trimKey(label.trim());
        if (!keys.add(key)) {
            throw new IllegalStateException("two fields of '" + title + "' share the option key " + key);
        }
        return key;
    }

    /** The fields of one kind are read in the order they were added, as GenericDialog does. */
    private Field take(Kind kind) {
        int wanted = taken[kind.ordinal()]++;
        int seen = 0;
        for (Field f : fields) {
            if (f.kind == kind && seen++ == wanted) {
                return f;
            }
        }
        throw new IllegalStateException("no more " + kind.name().toLowerCase(Locale.ROOT) + " fields");
    }

    private void remember(Field f, String value) {
        if (f.remembered && !fromMacro() && dialog != null) {
            Prefs.set(prefix + f.key, value);
        }
    }

    private double parse(String text, String key) {
        try {
            return Double.parseDouble(text.trim());
        } catch (NumberFormatException e) {
            throw new InputException(null, "the option " + key + "=" + text + " of " + title + " is not a number");
        }
    }

    /** ImageJ's rule for check boxes in an options string: the key appears as a word outside brackets. */
    static boolean hasFlag(String options, String key) {
        String s = " " + options + " ";
        int depth = 0;
        for (int i = 0; i + key.length() + 1 < s.length(); i++) {
            char c = s.charAt(i);
            if (c == '[') {
                depth++;
            } else if (c == ']') {
                depth = Math.max(0, depth - 1);
            } else if (depth == 0 && c == ' ' && s.startsWith(key, i + 1) && s.charAt(i + 1 + key.length()) == ' ') {
                return true;
            }
        }
        return false;
    }
}
