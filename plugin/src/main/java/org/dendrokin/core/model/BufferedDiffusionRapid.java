package org.dendrokin.core.model;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * {@code buffered-diffusion-rapid}: the parameters of {@code buffered-diffusion} under the rapid buffer
 * approximation linearised at rest (c &lt;&lt; Kd; Wagner &amp; Keizer 1994, sheet s3.2), which reduces it to
 * diffusion-decay: kappa = B_total / Kd, D_eff = (D_ca + kappa D_buffer) / (1 + kappa), k_eff = k / (1 + kappa),
 * and a stimulus raises free Ca by its amount / (1 + kappa) (a clamp holds free Ca at its value). The kymograph
 * shows free Ca in uM.
 */
final class BufferedDiffusionRapid implements BuiltInModel {
    @Override
    public String name() {
        return "buffered-diffusion-rapid";
    }

    @Override
    public List<ModelParameter> parameters() {
        return BufferedDiffusion.PARAMETERS;
    }

    @Override
    public String observedSpecies() {
        return "Ca";
    }

    @Override
    public String signalUnit() {
        return "uM";
    }

    @Override
    public Engine engine() {
        return Engine.SCALAR;
    }

    /** 0: it runs as diffusion-decay, whose decay is integrated exactly. */
    @Override
    public double stiffnessPerS(double[] p) {
        return 0;
    }

    @Override
    public Realisation realise(double[] p, List<Stimulus> stimuli) {
        double kappa = p[2] / p[3];
        double dEff = (p[0] + kappa * p[1]) / (1 + kappa);
        double kEff = p[5] / (1 + kappa);
        Map<String, Double> figures = new LinkedHashMap<>();
        figures.put("buffer_capacity", kappa);
        figures.put("effective_D_um2_per_s", dEff);
        figures.put("effective_k_per_s", kEff);
        List<Stimulus> scaled = new ArrayList<>();
        for (Stimulus s : stimuli) {
            // total calcium added splits into free and bound; the free part is 1 / (1 + kappa)
            double amount = s.kind() == Stimulus.Kind.CLAMP ? s.amount() : s.amount() / (1 + kappa);
            scaled.add(new Stimulus(s.timeS(), s.positionUm(), s.widthUm(), amount, s.kind(), s.durationS(), null));
        }
        return new Realisation.Scalar(ModelCatalogue.DIFFUSION_DECAY, new double[] {dEff, kEff}, scaled,
                observedSpecies(), figures);
    }
}
