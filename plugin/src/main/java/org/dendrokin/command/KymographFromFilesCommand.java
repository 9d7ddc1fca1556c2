package org.dendrokin.command;

import java.io.File;

import org.dendrokin.core.kymo.Extraction;
import org.dendrokin.core.path.DendritePath;
import org.dendrokin.io.InputException;
import org.dendrokin.io.KymographCsv;
import org.dendrokin.io.movie.Movie;
import org.dendrokin.io.movie.PathExtraction;
import org.dendrokin.io.path.PathFiles;
import org.scijava.ItemIO;
import org.scijava.app.StatusService;
import org.scijava.command.Command;
import org.scijava.command.ContextCommand;
import org.scijava.plugin.Parameter;
import org.scijava.plugin.Plugin;
import org.scijava.widget.FileWidget;

/**
 * The kymograph of a movie file along a path file (.roi, RoiSet.zip or x,y CSV), written as the contract's
 * kymograph CSV: the same extraction as Plugins > Dendrokin > Kymograph Along Line, for scripts and
 * headless runs.
 */
@Plugin(type = Command.class, headless = true, menuPath = "Plugins>Dendrokin>Scripting>Kymograph from Files")
public class KymographFromFilesCommand extends ContextCommand {
    @Parameter(label = "Movie (TIFF)")
    private File movie;

    @Parameter(label = "Path (.roi, RoiSet.zip or x,y CSV)")
    private File path;

    @Parameter(label = "Band width (um)", min = "0")
    private double bandWidthUm = 1.0;

    @Parameter(label = "Channel (1-based)", min = "1")
    private int channel = 1;

    @Parameter(label = "Pixel size (um; 0: from the TIFF)", min = "0")
    private double pixelSizeUm;

    @Parameter(label = "Frame interval (s; 0: from the TIFF)", min = "0")
    private double frameIntervalS;

    @Parameter(label = "Kymograph CSV to write", style = FileWidget.SAVE_STYLE)
    private File output;

    @Parameter(required = false)
    private StatusService status;

    @Parameter(type = ItemIO.OUTPUT, label = "Positions")
    private int positions;

    @Parameter(type = ItemIO.OUTPUT, label = "Frames")
    private int frames;

    @Parameter(type = ItemIO.OUTPUT, label = "Fraction of the path outside the image")
    private double fractionOutside;

    @Override
    public void run() {
        StatusProgress progress = new StatusProgress(status, "Kymograph from Files");
        try (Movie m = Movie.open(movie.toPath(), pixelSizeUm > 0 ? pixelSizeUm : null,
                frameIntervalS > 0 ? frameIntervalS : null)) {
            if (channel > m.channelCount()) {
                throw new InputException(movie.toPath(), "has " + m.channelCount() + " channel(s); channel " + channel
                        + " does not exist");
            }
            DendritePath p = PathFiles.read(path.toPath(), null);
            Extraction e = PathExtraction.extract(m, channel - 1, p, path.toPath(), bandWidthUm, progress);
            KymographCsv.write(e.kymograph(), output.toPath());
            positions = e.kymograph().positionCount();
            frames = e.kymograph().frameCount();
            fractionOutside = e.fractionOutside();
        } catch (RuntimeException e) {
            cancel(Commands.sentence(e));
        } finally {
            progress.finish();
        }
    }
}
