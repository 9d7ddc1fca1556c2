package org.dendrokin.core.model;

import java.util.Collections;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Objects;

/**
 * What the deterministic engine runs for a built-in model at given parameter values: a scalar model on
 * {@link ScalarRun}, or a reaction network on {@link NetworkRun}. A model may reduce to another one (the rapid
 * buffer approximation is diffusion-decay with effective constants and scaled stimuli).
 */
public sealed interface Realisation permits Realisation.Scalar, Realisation.Network {
    /**
     * A one-species model.
     *
     * @param model      the scalar model run
     * @param parameters its parameter values, in its order. Copied.
     * @param stimuli    the protocol it runs with
     * @param species    name of the species the kymograph shows
     * @param figures    derived figures worth reporting beside the solver's, by key (e.g. an effective rate), in
     *                   the order given
     */
    record Scalar(ScalarModel model, double[] parameters, List<Stimulus> stimuli, String species,
            Map<String, Double> figures) implements Realisation {
        public Scalar {
            Objects.requireNonNull(model, "model");
            parameters = parameters.clone();
            stimuli = List.copyOf(stimuli);
            Objects.requireNonNull(species, "species");
            figures = Collections.unmodifiableMap(new LinkedHashMap<>(figures));
        }

        @Override
        public double[] parameters() {
            return parameters.clone();
        }
    }

    /** A reaction network; stimuli act on the species they name, or on the model's observed species. */
    record Network(ReactionNetwork network) implements Realisation {
        public Network {
            Objects.requireNonNull(network, "network");
        }
    }
}
