package org.dendrokin.ij1;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;

import ij.Macro;

import org.dendrokin.io.InputException;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;

class OptionsDialogTest {
    @BeforeAll
    static void headless() {
        HeadlessImageJ.start();
    }

    private String threadName;

    @BeforeEach
    void actLikeImageJsCommandThread() {
        // ImageJ gives options only to threads whose name starts with "Run$_", as IJ.run names its thread
        threadName = Thread.currentThread().getName();
        Thread.currentThread().setName("Run$_" + threadName);
    }

    @AfterEach
    void clearOptions() {
        Macro.setOptions(null);
        Thread.currentThread().setName(threadName);
    }

    @Test
    void readsTheMacroOptionsByTheFirstWordOfEachLabel() {
        Macro.setOptions("pixel=0.2 band=1.5 lines=[selected in ROI Manager] save=[/tmp/a b] smooth");
        OptionsDialog d = new OptionsDialog("Test", "test")
                .choice("Lines", new String[] {"current selection", "selected in ROI Manager"}, "current selection")
                .number("Pixel size (um)", 1, 3)
                .number("Band width (um)", 1, 3)
                .number("Step along the path (um)", 0.7, 3)
                .folder("Save to folder", "")
                .check("Smooth the path", false)
                .check("Overwrite files", true);
        assertTrue(d.show());
        assertEquals(List.of("lines", "pixel", "band", "step", "save", "smooth", "overwrite"), d.keys());
        assertEquals(0.2, d.nextNumber(), 0);
        assertEquals(1.5, d.nextNumber(), 0);
        assertEquals(0.7, d.nextNumber(), 0, "a number missing from the options keeps its default");
        assertEquals("selected in ROI Manager", d.nextChoice());
        assertEquals("/tmp/a b", d.nextText());
        assertTrue(d.nextCheck());
        // ImageJ's rule: a check box missing from the options string is off, whatever its default
        assertFalse(d.nextCheck());
    }

    @Test
    void checkBoxKeysInsideBracketsDoNotCount() {
        assertFalse(OptionsDialog.hasFlag("save=[/data/smooth and round]", "smooth"));
        assertTrue(OptionsDialog.hasFlag("save=[/data] smooth", "smooth"));
        assertFalse(OptionsDialog.hasFlag("smoothing=2", "smooth"));
    }

    @Test
    void withoutADisplayAndWithoutOptionsItSaysWhatIsMissing() {
        OptionsDialog d = new OptionsDialog("Kymograph Along Line", "test").number("Band width (um)", 1, 2);
        InputException e = assertThrows(InputException.class, d::show);
        assertEquals("Kymograph Along Line needs its options (e.g. from a macro) when ImageJ runs without a display.",
                e.getMessage());
    }

    @Test
    void aNumberThatIsNotOneNamesItsKey() {
        Macro.setOptions("band=wide");
        OptionsDialog d = new OptionsDialog("Test", "test").number("Band width (um)", 1, 2);
        d.show();
        InputException e = assertThrows(InputException.class, d::nextNumber);
        assertTrue(e.getMessage().contains("band=wide"), e.getMessage());
    }

    @Test
    void twoLabelsWithTheSameFirstWordAreRefused() {
        OptionsDialog d = new OptionsDialog("Test", "test").number("Band width (um)", 1, 2);
        assertThrows(IllegalStateException.class, () -> d.number("Band height (um)", 1, 2));
    }
}
