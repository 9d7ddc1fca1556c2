package org.dendrokin.ij1;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

import ij.IJ;
import ij.ImagePlus;
import ij.ImageStack;
import ij.WindowManager;
import ij.gui.Plot;
import ij.measure.ResultsTable;
import ij.plugin.PlugIn;
import ij.process.FloatProcessor;

import org.dendrokin.core.fit.FitResult;
import org.dendrokin.core.fit.Interval;
import org.dendrokin.core.fit.KymographFits;
import org.dendrokin.core.fit.ParameterEstimate;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.io.KymographCsv;
import org.dendrokin.io.session.FitSettings;
import org.dendrokin.io.plot.ColourScale;

/**
 * Plugins > Dendrokin > Fit Spread Models: fits reaction-diffusion models to the current kymograph (dF/F0 or
 * uM, e.g. from Analyze Session Folder) with the fitting core, and shows each model's parameters with units
 * and 95% intervals and its information criteria in a table, the best model's fit as a stack (measured,
 * fitted, residual on one colour scale) and as profiles (data as points, model as lines) with the residuals.
 */
public class Fit_Spread_Models implements PlugIn {
    static final String COMMAND = "Fit Spread Models";
    static final String[] CRITERIA = {"aicc", "aic", "bic"};

    @Override
    public void run(String arg) {
        ImagePlus current = WindowManager.getCurrentImage();
        if (current == null) {
            IJ.noImage();
            return;
        }
        IjProgress progress = new IjProgress(COMMAND);
        try {
            Kymograph k = KymographImage.fromImage(current);
            OptionsDialog d = new OptionsDialog(COMMAND, "fit");
            d.text("Models (comma separated: diffusion-decay, nagumo, fisher-kpp)",
                    String.join(", ", KymographFits.DEFAULT_MODELS), 30);
            d.number("Time of the stimulus (s)", k.timeS(k.frameCount() / 10), 3);
            d.number("Position of the stimulus (um along the path)",
                    Math.round(k.distanceUm(k.positionCount() / 2) * 100) / 100.0, 2);
            d.check("Free stimulus time and position (fitted, diffusion-decay)", false);
            d.check("Sealed ends (the path ends where the dendrite ends)", false);
            d.choice("Criterion for the best model", CRITERIA, CRITERIA[0]);
            d.number("Bootstrap replicates (0: none; random seed 1)", 0, 0);
            d.folder("Save table, fit CSV and TIFF to folder (empty: do not save)", "");
            if (!d.show()) {
                return;
            }
            List<String> models = new ArrayList<>();
            for (String m : d.nextText().split("[,;\\s]+")) {
                if (!m.isEmpty()) {
                    models.add(m.trim());
                }
            }
            double t0 = d.nextNumber();
            double x0 = d.nextNumber();
            boolean free = d.nextCheck();
            boolean sealed = d.nextCheck();
            String criterion = d.nextChoice();
            double replicates = d.nextNumber();
            String folder = d.nextText();
            if (!(replicates >= 0 && replicates <= FitSettings.MAX_BOOTSTRAP && replicates == Math.rint(replicates))) {
                throw new IllegalArgumentException("the number of bootstrap replicates must be a whole number from 0 to "
                        + FitSettings.MAX_BOOTSTRAP);
            }
            KymographFits.Setup setup = KymographFits.Setup.of(t0, x0).withModels(models).withFreeStimulus(free, free)
                    .withSealedEnds(sealed).withCriterion(criterion);
            setup = setup.withOptions(setup.options().withBootstrap((int) replicates, 1L));
            KymographFits.Outcome outcome = KymographFits.fit(k, setup, progress);
            outcome.warnings().forEach(w -> IJ.log(COMMAND + ": " + w));
            for (FitResult f : outcome.fits()) {
                f.warnings().forEach(w -> IJ.log(COMMAND + " (" + f.model() + "): " + w));
                if (!f.converged()) {
                    IJ.log(COMMAND + " (" + f.model() + "): not converged: " + f.reason());
                }
            }
            ResultsTable table = table(outcome);
            ImagePlus stack = null;
            Plot profiles = null;
            FitResult best = outcome.best().orElse(null);
            if (best != null && best.fitted() != null) {
                Kymograph fitted = k.withValues(best.fitted(), k.signalUnit());
                stack = stack(k, fitted, Titles.derived(current, "fit " + best.model(), k.signalUnit()));
                profiles = profiles(k, fitted, best.model(), t0);
            }
            if (!folder.isEmpty()) {
                Path dir = Path.of(folder);
                Tables.saveCsv(table, dir.resolve(current.getShortTitle() + "_fits.csv"));
                if (stack != null) {
                    KymographCsv.write(k.withValues(best.fitted(), k.signalUnit()),
                            dir.resolve(current.getShortTitle() + "_fit_" + best.model() + ".csv"));
                    Kymograph_Along_Line.saveTiff(stack, dir.resolve(current.getShortTitle() + "_fit.tif"));
                }
            }
            if (stack != null) {
                Display.showKymograph(stack, current);
                if (!OptionsDialog.headless()) {
                    Display.showPlot(profiles, stack.getWindow());
                }
            }
            Tables.show(table, "Dendrokin fits", stack != null ? stack.getWindow() : current.getWindow());
            progress.finish(COMMAND + ": " + (best == null ? "no model converged." : "best model " + best.model()
                    + " by " + outcome.criterion().toUpperCase(Locale.ROOT) + "."));
        } catch (RuntimeException e) {
            Failures.show(COMMAND, e);
        }
    }

    /** One row a parameter or derived quantity of each model, then each model's criteria and weight. */
    static ResultsTable table(KymographFits.Outcome o) {
        ResultsTable t = Tables.quantities();
        for (FitResult f : o.fits()) {
            String source = f.model() + (f.model().equals(o.bestModel()) ? " (best)" : "")
                    + (f.converged() ? "" : " (not converged)");
            List<ParameterEstimate> all = new ArrayList<>(f.parameters());
            all.addAll(f.derived());
            for (ParameterEstimate p : all) {
                // An interval of a quantity the data cannot fix would look precise and mean nothing: leave it empty.
                boolean shown = p.ci95() != null && p.identifiable();
                String note = p.identifiable()
                        ? (p.ci95() == null ? "no interval" : p.ci95().method())
                        : "not identifiable from these data: no interval; see the Log";
                if (p.atBound()) {
                    note += "; at its bound";
                }
                Tables.add(t, source, p.name(), p.value(), p.unit().symbol(),
                        shown ? p.ci95().lower() : Double.NaN, shown ? p.ci95().upper() : Double.NaN, note);
                if (p.identifiable()) {
                    // the other intervals (Wald-t beside a profile, a bootstrap on request), one row each
                    for (Interval other : p.otherIntervals()) {
                        Tables.add(t, source, p.name(), p.value(), p.unit().symbol(), other.lower(), other.upper(),
                                other.method());
                    }
                }
            }
            Tables.add(t, source, o.criterion().toUpperCase(Locale.ROOT), f.criterion(o.criterion()), "",
                    Double.NaN, Double.NaN, "lower is better");
            Double w = o.weights().get(f.model());
            Tables.add(t, source, "Akaike weight", w == null || !f.converged() ? Double.NaN : w, "", Double.NaN,
                    Double.NaN, f.converged() ? "" : "not converged: takes no part in the comparison");
            Tables.add(t, source, "RMSE", f.rmse(), "", Double.NaN, Double.NaN, "unweighted, signal units");
        }
        return t;
    }

    /** Measured, fitted and residual as one stack on one display range. */
    static ImagePlus stack(Kymograph measured, Kymograph fitted, String title) {
        double[] m = measured.values();
        double[] f = fitted.values();
        double[] r = new double[m.length];
        double[] all = new double[3 * m.length];
        for (int i = 0; i < m.length; i++) {
            r[i] = m[i] - f[i];
            all[i] = m[i];
            all[m.length + i] = f[i];
            all[2 * m.length + i] = r[i];
        }
        double[] range = KymographImage.displayRange(all);
        ImageStack stack = new ImageStack(measured.positionCount(), measured.frameCount());
        Kymograph[] ks = {measured, fitted, measured.withValues(r, measured.signalUnit())};
        String[] labels = {"measured", "fitted", "measured - fitted"};
        for (int i = 0; i < 3; i++) {
            stack.addSlice(labels[i], (FloatProcessor) KymographImage.toImage(ks[i], labels[i]).getProcessor());
        }
        ImagePlus image = new ImagePlus(title, stack);
        image.setCalibration(KymographImage.calibration(measured));
        image.getProcessor().setLut(KymographImage.lut(ColourScale.SEQUENTIAL));
        image.setDisplayRange(range[0], range[1]);
        return image;
    }

    /** Profiles at a few times after the stimulus: data as points, the model as lines. */
    static Plot profiles(Kymograph m, Kymograph fitted, String model, double stimulusTimeS) {
        return ProfilePlot.of("Fit of " + model + ": profiles (points: data, lines: model)", m, fitted, stimulusTimeS);
    }
}
