package org.dendrokin.core.analysis;

import org.dendrokin.core.Checks;

/**
 * A model of the default set that was not fitted because the data do not call for it, for example a
 * travelling-wave model where the arrival times show no front. It is listed as not tried, with the reason,
 * not as a failed fit.
 *
 * @param model  the model's name
 * @param reason one sentence saying why it was not fitted and how to fit it anyway
 */
public record SkippedModel(String model, String reason) {
    public SkippedModel {
        Checks.require(model != null && !model.isBlank(), "a skipped model needs a name");
        Checks.require(reason != null && !reason.isBlank(), "a skipped model needs a reason");
    }
}
