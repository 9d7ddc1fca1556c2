package org.dendrokin.core.model;

import java.util.List;
import java.util.Optional;

import org.dendrokin.core.Checks;

/**
 * The built-in models, one {@link BuiltInModel} entry each, in the order users see them listed. Everything that
 * takes a model by name (simulation, fitting, model files, comparison, the command line and the ImageJ dialogs)
 * looks it up here, so adding a model is adding its entry class and its line below (plus its tests).
 * <p>
 * Names are the keys of model files and results.json and never change: {@code diffusion-decay}, {@code nagumo},
 * {@code fisher-kpp} (one species, {@link ScalarModel}; these can also be fitted), {@code buffered-diffusion},
 * {@code buffered-diffusion-rapid} and {@code fitzhugh-nagumo}. A user's own reaction network is not an entry:
 * model files name it {@code "network"}.
 */
public final class ModelCatalogue {
    /** u_t = D u_xx - k u. */
    public static final ScalarModel DIFFUSION_DECAY = new DiffusionDecay();
    /** u_t = D u_xx + k u (1 - u)(u - a). */
    public static final ScalarModel NAGUMO = new Nagumo();
    /** u_t = D u_xx + r u (1 - u). */
    public static final ScalarModel FISHER_KPP = new FisherKpp();

    private static final List<BuiltInModel> ENTRIES = List.of(DIFFUSION_DECAY, NAGUMO, FISHER_KPP,
            new BufferedDiffusion(), new BufferedDiffusionRapid(), new FitzHughNagumo());

    private ModelCatalogue() {
    }

    /** Every built-in model, in listing order. */
    public static List<BuiltInModel> all() {
        return ENTRIES;
    }

    /** Every built-in model's name, in listing order. */
    public static List<String> names() {
        return ENTRIES.stream().map(BuiltInModel::name).toList();
    }

    /** The one-species models (the ones a kymograph can be fitted with), in listing order. */
    public static List<ScalarModel> scalarModels() {
        return ENTRIES.stream().filter(ScalarModel.class::isInstance).map(ScalarModel.class::cast).toList();
    }

    /** The one-species models' names, in listing order. */
    public static List<String> scalarNames() {
        return scalarModels().stream().map(BuiltInModel::name).toList();
    }

    /** The entry of that name, if there is one. */
    public static Optional<BuiltInModel> find(String name) {
        return ENTRIES.stream().filter(e -> e.name().equals(name)).findFirst();
    }

    /**
     * The entry of that name.
     *
     * @throws IllegalArgumentException for a name that is not in the catalogue
     */
    public static BuiltInModel get(String name) {
        return find(name).orElseThrow(() -> new IllegalArgumentException("unknown model '" + name + "'; known: "
                + names() + " or a network"));
    }

    /** The one-species entry of that name, if there is one. */
    public static Optional<ScalarModel> findScalar(String name) {
        return scalarModels().stream().filter(e -> e.name().equals(name)).findFirst();
    }

    /**
     * The one-species entry of that name.
     *
     * @throws IllegalArgumentException for a name that is not a one-species built-in model
     */
    public static ScalarModel scalar(String name) {
        Optional<ScalarModel> found = findScalar(name);
        Checks.require(found.isPresent(), "unknown scalar model '" + name + "'; known: " + scalarNames());
        return found.get();
    }
}
