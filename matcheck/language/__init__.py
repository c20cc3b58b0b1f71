"""Language processing shared by the measures: words, sentences, lemmas, syllables."""
